// Browser entry point: defines the elements; index.html places <gw-app>.
import './gw-app.js';
