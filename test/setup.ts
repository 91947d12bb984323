// The unit engine (mathjs units) is loaded at once here, as the CLI does; the app loads it after first render.
import '../src/model/units-mathjs.js';
