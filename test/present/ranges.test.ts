import { describe, expect, it } from 'vitest';
import { analyse } from '../../src/analysis/report.js';
import { bomRows, bomCsv } from '../../src/present/bom.js';
import { schematic } from '../../src/present/schematic.js';
import { calibrationSteps } from '../../src/present/calibration.js';
import { positionNetlist, rangeLines, rangeTable } from '../../src/present/ranges.js';
import { textReport } from '../../src/present/text-report.js';
import { designFrom } from '../helpers.js';

const two = analyse(designFrom('two-range-clamp'), { spreadTrials: 0 });
const one = analyse(designFrom('two-range-clamp', (x) => { x.target.rangeSwitch = 'single-pole'; }), { spreadTrials: 0 });

describe('the range switch in the parts list', () => {
  it('lists the switch with its poles and throws, and each position\'s own parts tagged with their range', () => {
    const rows = bomRows(two);
    const sw = rows.find((r) => r.ref === 'SW1')!;
    expect(sw.value).toBe('2-pole 2-way switch');
    expect(sw.role).toMatch(/feedback arm and the reference divider/);
    expect(rows.find((r) => r.ref === 'RV3')!.role).toMatch(/\(range 2\)/);
    expect(rows.find((r) => r.ref === 'R2')!.role).not.toMatch(/range/);
    expect(bomRows(one).find((r) => r.ref === 'SW1')!.value).toBe('1-pole 2-way switch');
    expect(bomCsv(two).split('\r\n').find((l) => l.startsWith('"SW1"'))).toMatch(/^"SW1","2-pole 2-way switch",/);
  });
});

describe('the range switch in the schematic', () => {
  it('draws one feedback row per position from the throws of SW1a, and names the second pole\'s dividers', () => {
    const d = schematic(two)!;
    const texts = d.prims.filter((p) => p.t === 'text').map((p) => (p as { text: string }).text);
    expect(texts).toContain('SW1a');
    expect(texts.some((t) => /^SW1b picks the reference divider/.test(t))).toBe(true);
    const fb = d.prims.filter((p) => p.t === 'res' && !p.vertical && p.y <= 80);
    // Range 1's R1 and RV1, range 2's arm (two parts in series) and RV3.
    expect(fb.map((p) => (p as { ref: string }).ref)).toEqual(expect.arrayContaining(['R1', 'RV1', 'RV3']));
    const single = schematic(one)!.prims.filter((p) => p.t === 'text').map((p) => (p as { text: string }).text);
    expect(single).toContain('SW1');
    expect(single.some((t) => /SW1b/.test(t))).toBe(false);
  });
});

describe('the calibration, range by range', () => {
  it('two poles: each range sets its own span and zero at its own switch position', () => {
    const t = calibrationSteps(two).map((s) => s.text);
    expect(t.some((x) => /^Range 1 \(100 mV\/A\): set SW1 to position 1/.test(x))).toBe(true);
    expect(t.some((x) => /^Range 2 \(40\.0 mV\/A\): set SW1 to position 2\.$/.test(x))).toBe(true);
    expect(t.some((x) => /^Range 2 .*turn RV3/.test(x))).toBe(true);
    expect(t.some((x) => /^Range 2 .*turn RV4 \(zero trimmer\)/.test(x))).toBe(true);
    expect(t.some((x) => /^Before power, range 2/.test(x))).toBe(true);
  });
  it('one pole: the shared zero trimmer is left where range 1 set it, and range 2\'s zero is read', () => {
    const t = calibrationSteps(one).map((s) => s.text);
    expect(t.some((x) => /Leave RV2 \(zero trimmer\) where range 1 set it: with nothing applied this range reads 2\.990 V/.test(x))).toBe(true);
    expect(t.some((x) => /^Range 2 .*turn RV2/.test(x))).toBe(false);
  });
});

describe('the ranges table, text and netlists', () => {
  it('one row per range, in words, with no NaN', () => {
    const t = rangeTable(two)!;
    expect(t.rows.length).toBe(2);
    expect(t.rows[1]!.cells[1]).toBe('40.0 mV/A');
    for (const r of t.rows) for (const c of r.cells) expect(c).not.toMatch(/NaN|Infinity|undefined/);
    expect(rangeLines(two)[1]).toMatch(/^Ranges: SW1, two poles/);
    expect(textReport(two)).toMatch(/Ranges: SW1/);
  });
  it('each position exports as its own netlist, and there is none past the last', () => {
    expect(positionNetlist(two, 1)).toMatch(/at position 1 of 2/);
    expect(positionNetlist(two, 2)).toMatch(/at position 2 of 2: 40\.00 mV\/A/);
    expect(positionNetlist(two, 3)).toBeNull();
    expect(rangeTable(analyse(designFrom('bench-clamp'), { spreadTrials: 0 }))).toBeNull();
  });
});
