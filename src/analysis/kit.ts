/**
 * What a resistor kit means for the report: a parts list that takes a value more often than the kit holds
 * it (the solver builds each network from what the networks before it left of the kit, src/solve/kit.ts, so
 * this is the check on the whole build, the stage's and a range switch's), and, when the kit cannot meet the
 * target, how close it gets and the one value to buy that would fix it, found by solving the stage again
 * with each value of the next series added to the kit.
 */
import type { Design } from '../model/design.js';
import { finding, type Finding } from '../model/findings.js';
import { kitValues, seriesToBuyFrom } from '../model/kit.js';
import { valuesInRange } from '../model/eseries.js';
import type { SensorFront } from '../physics/sensors.js';
import type { IdealStage } from '../physics/topology.js';
import { solveStage, type SolvedStage } from '../solve/stage.js';
import { kitShortfall } from '../solve/kit.js';

/** A stage the solver could not build to the target (a fail finding of its own). */
const failed = (s: SolvedStage) => s.warnings.some((w) => w.level === 'fail') || !Number.isFinite(s.gain);

/** The scale error a stage reached, when the solver says (a finite number), else null. */
function reached(s: SolvedStage): number | null {
  const w = s.warnings.find((x) => x.code === 'scale-off-target');
  if (w && w.code === 'scale-off-target') return w.data.error;
  return Number.isFinite(s.scaleError) ? s.scaleError : null;
}

/**
 * The one value to buy: every value of the next series in the resistance window that the kit lacks is added
 * to it (as many as needed) and the stage solved again; the value whose stage meets the target with the
 * smallest scale error wins, else the one that comes closest. Null when the kit has no next series or no
 * value changes anything.
 */
export function valueToBuy(design: Design, front: SensorFront, ideal: IdealStage): { ohms: number; series: string; stage: SolvedStage } | null {
  const kit = design.target.kit;
  if (!kit) return null;
  const series = seriesToBuyFrom(kit);
  if (!series) return null;
  const held = kitValues(kit, design.target.resistanceMin, design.target.resistanceMax);
  const has = (v: number) => held.some((h) => Math.abs(h.ohms - v) <= v * 1e-9);
  let best: { ohms: number; stage: SolvedStage; ok: boolean; err: number } | null = null;
  for (const ohms of valuesInRange(series, design.target.resistanceMin, design.target.resistanceMax)) {
    if (has(ohms)) continue;
    const d: Design = { ...design, target: { ...design.target, kit: { ...kit, parts: [...kit.parts, { ohms }] } } };
    const stage = solveStage(d, front, ideal);
    const ok = !failed(stage);
    const err = Math.abs(reached(stage) ?? Infinity);
    if (!best || (ok && !best.ok) || (ok === best.ok && err < best.err)) best = { ohms, stage, ok, err };
  }
  return best && Number.isFinite(best.err) ? { ohms: best.ohms, series, stage: best.stage } : null;
}

/** The kit's findings for a solved (or failed) stage: values used beyond the kit, or the value to buy. */
export function kitFindings(design: Design, front: SensorFront, ideal: IdealStage, stage: SolvedStage): Finding[] {
  const kit = design.target.kit;
  if (!kit) return [];
  if (!failed(stage)) {
    return kitShortfall(stage.parts, kitValues(kit, design.target.resistanceMin, design.target.resistanceMax)).map((s) => finding('kit-quantity', 'fail', s));
  }
  const buy = valueToBuy(design, front, ideal);
  const withIt = buy ? reached(buy.stage) : null;
  const off = stage.warnings.find((w) => w.code === 'scale-off-target');
  return [finding('kit-short', 'fail', {
    error: reached(stage), accept: off && off.code === 'scale-off-target' ? off.data.accept : null,
    buy: buy ? { ohms: buy.ohms, series: buy.series, error: withIt, meets: !failed(buy.stage), uses: buy.stage.parts.filter((p) => p.kind === 'resistor' && Math.abs(p.ohms - buy.ohms) <= buy.ohms * 1e-9).length } : null,
  })];
}

/**
 * A range switch's whole parts list against the kit (every position's own parts are on the board at once):
 * `kit-quantity` for each value it takes more often than held, leaving out values the stage's own parts
 * already overuse (said once, by `kitFindings`).
 */
export function switchKitFindings(design: Design, switchParts: ReadonlyArray<{ kind: string; ohms: number; role: string }>, stageParts: ReadonlyArray<{ kind: string; ohms: number; role: string }>): Finding[] {
  const kit = design.target.kit;
  if (!kit) return [];
  const held = kitValues(kit, design.target.resistanceMin, design.target.resistanceMax);
  const already = kitShortfall(stageParts, held).map((s) => s.ohms);
  return kitShortfall(switchParts, held).filter((s) => !already.includes(s.ohms)).map((s) => finding('kit-quantity', 'fail', s));
}
