/**
 * The unit engine: mathjs units, on a private instance with only the unit machinery (plus gauss, which
 * mathjs does not define). Importing this module installs it into src/model/units.ts.
 */
import { create, unitDependencies, createUnitDependencies } from 'mathjs';
import { setUnitEngine } from './units.js';

const math = create({ unitDependencies, createUnitDependencies });
// 1 G = 1e-4 T (SI Brochure, 9th ed., table 10: non-SI units of the CGS system).
math.createUnit('gauss', { definition: '1e-4 T', aliases: ['gausses'] });

setUnitEngine((expr, target) => {
  try {
    return math.unit(expr).toNumber(target);
  } catch {
    return null;
  }
});

export const unitsReady = true;
