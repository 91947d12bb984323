// Browser entry point: the page's own few rules, then the elements; index.html places <gw-app>.
import './page.css';
import './gw-app.js';
