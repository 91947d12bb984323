import { describe, expect, it } from 'vitest';
import { bomCsv, bomRows, dissipations, powerRating } from '../../src/present/bom.js';
import { analyse } from '../../src/analysis/report.js';
import { textReport } from '../../src/present/text-report.js';
import { designFrom, shuntOnSplitSupply } from '../helpers.js';

describe('parts list', () => {
  it('power rating keeps dissipation at or under half the rating (50 % derating, common practice)', () => {
    expect(powerRating(0.01)).toBe(0.125);
    expect(powerRating(0.0625)).toBe(0.125);
    expect(powerRating(0.07)).toBe(0.25);
    expect(powerRating(0.3)).toBe(1);
  });
  it('a shunt at its range end dissipates I²R (Joule) and is rated for it', () => {
    const r = analyse(designFrom('generic-sensor', shuntOnSplitSupply), { spreadTrials: 0 });
    // 5 A through 10 mΩ: 0.25 W (the input network's share of the current is negligible).
    expect(dissipations(r).get('RSH')! / 0.25).toBeCloseTo(1, 3);
  });
  it('a current transformer\'s burden is a part: in the rows, the CSV and the text report, with its IEC 60062 code', () => {
    const r = analyse(designFrom('appliance-ct'), { spreadTrials: 0 });
    const rb = bomRows(r).find((x) => x.ref === 'RB');
    expect(rb).toBeDefined();
    // IEC 60062: 33 Ω with three significant figures (the design's E96 series) is written 33R0.
    expect(rb!.code).toBe('33R0');
    expect(rb!.role).toMatch(/burden/);
    expect(rb!.rating).toBeGreaterThanOrEqual(0.25);
    expect(bomCsv(r)).toMatch(/"RB","33\.0 Ω","33R0"/);
    expect(textReport(r)).toMatch(/RB\s+33\.0 Ω\s+33R0/);
    expect(bomRows(analyse(designFrom('bench-clamp'), { spreadTrials: 0 })).some((x) => x.ref === 'RB')).toBe(false);
  });
  it('lists every stage part once with its code, plus the sensor, the op-amp and its decoupling', () => {
    const r = analyse(designFrom('bench-clamp'), { spreadTrials: 0 });
    const rows = bomRows(r);
    for (const p of r.stage!.parts) expect(rows.filter((x) => x.ref === p.ref).length).toBe(1);
    expect(rows.map((x) => x.ref)).toEqual(expect.arrayContaining(['S1', 'U1', 'U2', 'C9']));
    for (const row of rows.filter((x) => x.ref.startsWith('R'))) expect(row.rating).toBeGreaterThanOrEqual(0.125);
  });
  it('CSV quotes every cell, neutralises formulas and keeps the cautions in a header comment, out of the table', () => {
    const r = analyse(designFrom('generic-sensor', (x) => { x.opamp.name = '=HYPERLINK("x")'; }), { spreadTrials: 0 });
    const csv = bomCsv(r);
    const lines = csv.trim().split('\r\n');
    const table = lines.filter((l) => !l.startsWith('#'));
    expect(lines.slice(0, lines.length - table.length).every((l) => l.startsWith('# CAUTION: '))).toBe(true);
    expect(table[0]).toBe('"Designator","Value","Code (IEC 60062)","Specification","Dissipation (W)","Rating (W)","Quantity","Role"');
    // Every table row has the header's eight cells and no caution.
    for (const row of table) expect(row.match(/"(?:[^"]|"")*"/g)!.length, row).toBe(8);
    expect(table.join('\n')).not.toMatch(/CAUTION/);
    expect(csv).toContain(`"'=HYPERLINK(""x"")"`);
    // A voltage-output module: the cautions worded for a sensor the current may pass through.
    expect(csv).toMatch(/^# CAUTION: A sensor module that the measured current passes through/m);
    expect(csv).toMatch(/measurement-category/);
  });
});
