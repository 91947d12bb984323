/**
 * The build-ready parts list: every part with designator, value, IEC 60062 code, series and tolerance, power
 * rating, quantity and role, plus the op-amp and its decoupling; and its CSV export.
 */
import { partCode, partRole, partValue } from './parts.js';
import type { Report } from '../analysis/report.js';
import type { RangeSwitch } from '../analysis/ranges.js';
import { cautionsFor } from './cautions.js';
import { peakRange } from '../physics/topology.js';
import { formatEng } from '../model/units.js';
import { csvCell, spiceCommentText } from './inert.js';
import { closedLoopBomRows } from './closed-loop.js';

export interface BomRow {
  ref: string;
  value: string;
  code: string;
  spec: string;
  /** Worst dissipation over the range, W (resistors). */
  dissipation: number | null;
  /** Rating to buy, W (resistors), with 50 % derating (common practice). */
  rating: number | null;
  quantity: number;
  role: string;
}

/** Standard resistor power ratings, W (common practice: 1/8, 1/4, 1/2, 1 W through-hole). */
const POWER_RATINGS = [0.125, 0.25, 0.5, 1, 2];

/** The smallest rating that keeps dissipation at or under half of it (50 % derating, common practice). */
export function powerRating(watts: number): number {
  return POWER_RATINGS.find((r) => watts <= r / 2) ?? POWER_RATINGS[POWER_RATINGS.length - 1]!;
}

/** Worst-case dissipation of each circuit resistor over the range ends and zero, W, by element name. */
export function dissipations(r: Report): Map<string, number> {
  const out = new Map<string, number>();
  const sc = r.circuit;
  if (!sc || !r.dc) return out;
  const { c0, c1 } = r.dc;
  const v = (col: Float64Array, n: number) => (n > 0 ? col[n - 1]! : 0);
  const [a, b] = peakRange(r.design);
  const lo = Math.max(a, r.clip?.measurandLow ?? a), hi = Math.min(b, r.clip?.measurandHigh ?? b);
  for (const e of sc.circuit.elements) {
    if (e.kind !== 'R' || e.value <= 0) continue;
    let worst = 0;
    for (const x of [lo, 0, hi]) {
      const dv = v(c0, e.a) - v(c0, e.b) + (v(c1, e.a) - v(c1, e.b)) * x;
      worst = Math.max(worst, (dv * dv) / e.value);
    }
    out.set(e.name, worst);
  }
  return out;
}

/** Issue 19: each element's worst dissipation over the switch's positions. */
function switchDissipations(rs: RangeSwitch): Map<string, number> {
  const out = new Map<string, number>();
  for (const p of rs.positions) if (p.report) for (const [k, w] of dissipations(p.report)) out.set(k, Math.max(out.get(k) ?? 0, w));
  return out;
}

/** Issue 19: which ranges a part serves, when not all of them: ` (range 2)`. */
function rangeTag(rs: RangeSwitch, ref: string): string {
  const on = rs.positions.filter((p) => p.parts.some((q) => q.ref === ref)).map((p) => p.index + 1);
  return on.length === rs.positions.length ? '' : ` (range ${on.join(', ')})`;
}

/** The parts list rows: resistors and trimmers grouped by value and series, then sensor, regulator, op-amp and decoupling. */
export function bomRows(r: Report): BomRow[] {
  const rows: BomRow[] = [];
  const s = r.stage;
  // Issue 19: with a range switch, every position's parts once each (the dissipation the worst over the
  // positions that use it), tagged with the range they belong to, and the switch itself.
  const rs = r.ranges?.ok ? r.ranges.value : null;
  const diss = rs ? switchDissipations(rs) : dissipations(r);
  if (s) {
    for (const p of rs ? rs.parts : s.parts) {
      const pw = p.kind === 'capacitor' ? null : p.kind === 'trimmer' ? Math.max(diss.get(`${p.ref}A`) ?? 0, diss.get(`${p.ref}B`) ?? 0, diss.get(p.ref) ?? 0) : diss.get(p.ref) ?? 0;
      rows.push({
        ref: p.ref,
        value: partValue(p),
        code: partCode(p),
        spec: p.kind === 'trimmer' ? `trimmer ±${+(p.tolerance * 100).toFixed(2)} %, single-turn cermet` : p.kind === 'capacitor' ? 'ceramic C0G/NP0 ±10 %' : `${p.series} ±${+(p.tolerance * 100).toFixed(2)} % metal film`,
        dissipation: pw,
        // The burden is bought at the rating the design states, or higher if the range needs it.
        rating: pw === null ? null : p.role === 'burden' && r.design.sensor.type === 'current-transformer' ? Math.max(powerRating(pw), r.design.sensor.burdenPower) : powerRating(pw),
        quantity: 1,
        role: partRole(p) + (rs ? rangeTag(rs, p.ref) : ''),
      });
    }
  }
  if (rs) {
    rows.push({
      ref: rs.switchRef, value: `${rs.poles}-pole ${rs.throws}-way switch`, code: '',
      spec: 'rotary or slide, make-before-break (shorting), so the feedback loop never opens while switching (common practice)',
      dissipation: null, rating: null, quantity: 1,
      role: rs.wiring === 'single-pole' ? 'range switch: picks the feedback arm' : 'range switch: picks the feedback arm and the reference divider',
    });
  }
  const sensorName: Record<string, string> = {
    'hall-gap-core': `linear Hall sensor in a ${formatEng(r.design.sensor.type === 'hall-gap-core' ? r.design.sensor.core.gap : 0, 'm')} core gap`,
    'current-transformer': 'current transformer (its burden is RB above)',
    shunt: `shunt ${formatEng(r.design.sensor.type === 'shunt' ? r.design.sensor.resistance : 0, 'Ω')}`,
    'voltage-output': 'voltage-output sensor',
    'closed-loop-hall': 'linear Hall sensor in the core gap',
  };
  rows.push({ ref: 'S1', value: sensorName[r.design.sensor.type] ?? 'sensor', code: '', spec: `${formatEng(r.front.sensitivity, `V/${r.design.sensor.measurand}`)} as designed`, dissipation: null, rating: null, quantity: 1, role: 'sensor' });
  // --- closed-loop Hall sensor (issue #20): the winding, R_M, the compensation and the driver ---
  rows.push(...closedLoopBomRows(r, diss, powerRating));
  if (r.design.supply.regulated) {
    rows.push({ ref: 'U2', value: `${formatEng(r.design.supply.regulated.voltage, 'V')} regulator`, code: '', spec: `low-dropout, ±${+(r.design.supply.regulated.tolerance * 100).toFixed(2)} %, with its input and output capacitors`, dissipation: null, rating: null, quantity: 1, role: 'regulated rail for the sensor and/or reference' });
  }
  rows.push({ ref: 'U1', value: r.design.opamp.name || 'op-amp', code: '', spec: `GBW ${formatEng(r.design.opamp.gbw, 'Hz')}, SR ${formatEng(r.design.opamp.slewRate, 'V/s')}`, dissipation: null, rating: null, quantity: 1, role: 'amplifier' });
  rows.push({ ref: 'C9', value: '100 nF', code: '104', spec: 'ceramic X7R, 50 V', dissipation: null, rating: null, quantity: 1, role: 'supply decoupling at U1 (common practice)' });
  return rows;
}

/**
 * The parts list as CSV (RFC 4180 quoting): the table alone, so that parts-list importers read it cleanly,
 * after a header comment (lines starting `#`) that carries the safety cautions. Numbers are written as
 * numbers; every text cell goes through the formula guard.
 */
export function bomCsv(r: Report): string {
  const head = ['Designator', 'Value', 'Code (IEC 60062)', 'Specification', 'Dissipation (W)', 'Rating (W)', 'Quantity', 'Role'];
  const lines = cautionLines(r).map((c) => `# ${c}`);
  lines.push(head.map(csvCell).join(','));
  for (const row of bomRows(r)) {
    lines.push([row.ref, row.value, row.code, row.spec, row.dissipation === null ? null : Number(row.dissipation.toPrecision(3)), row.rating, row.quantity, row.role].map(csvCell).join(','));
  }
  return lines.join('\r\n') + '\r\n';
}

/** The cautions for the CSV's header comment, one line each, with nothing in them that could end the comment. */
function cautionLines(r: Report): string[] {
  return cautionsFor(r.design.sensor.type, r.front.cautions).map((c) => `CAUTION: ${spiceCommentText(c, 1000)}`);
}
