/**
 * The unit engine: mathjs, on a private instance with only units, the four operations, powers, square roots
 * and pi (plus gauss, which mathjs does not define), so that a field can hold arithmetic such as
 * `1/(2*pi*10k*10n)` and nothing else. Importing this module installs it into src/model/units.ts.
 */
import {
  create, evaluateDependencies, unitDependencies, createUnitDependencies, addDependencies, subtractDependencies, multiplyDependencies,
  divideDependencies, powDependencies, sqrtDependencies, unaryMinusDependencies, unaryPlusDependencies, piDependencies,
} from 'mathjs';
import { setUnitEngine } from './units.js';

const math = create({
  evaluateDependencies, unitDependencies, createUnitDependencies, addDependencies, subtractDependencies, multiplyDependencies,
  divideDependencies, powDependencies, sqrtDependencies, unaryMinusDependencies, unaryPlusDependencies, piDependencies,
});
// 1 G = 1e-4 T (SI Brochure, 9th ed., table 10: non-SI units of the CGS system).
math.createUnit('gauss', { definition: '1e-4 T', aliases: ['gausses'] });
const evaluate = math.evaluate;

setUnitEngine((expr, target) => {
  try {
    const r: unknown = evaluate(expr);
    // A plain number carries no unit; "%" is mathjs's percent, already a fraction.
    if (typeof r === 'number') return { value: r, bare: !expr.includes('%') };
    if (r instanceof math.Unit) return { value: r.toNumber(target), bare: false };
    return null;
  } catch {
    return null;
  }
});
