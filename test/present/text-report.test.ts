import { describe, expect, it } from 'vitest';
import { textReport } from '../../src/present/text-report.js';
import { keyFigures } from '../../src/present/figures.js';
import { analyse } from '../../src/analysis/report.js';
import { DEMOS } from '../../src/model/demos.js';
import { designFrom } from '../helpers.js';

describe('text report and key figures', () => {
  it.each(DEMOS.map((d) => d.id))('%s: every section, no NaN or Infinity', (id) => {
    const r = analyse(designFrom(id), { spreadTrials: 100 });
    const t = textReport(r);
    for (const h of ['Verdict', 'Stage', 'Parts', 'Range and clipping', 'Bandwidth', 'Noise', 'DC error budget', 'Supply', 'Calibration', 'Safety']) expect(t).toContain(h);
    expect(t).not.toMatch(/NaN|Infinity/);
    for (const row of keyFigures(r)) expect(`${row.value} ${row.note ?? ''}`).not.toMatch(/NaN|Infinity/);
  });
  it('a design with no stage still prints its verdict, guidance and the cautions', () => {
    const t = textReport(analyse(designFrom('generic-sensor', (x) => { x.target.scale = 0.005; x.target.zero = 2.5; x.target.topology = 'non-inverting'; }), { spreadTrials: 0 }));
    expect(t).toMatch(/\[FAIL\]/);
    expect(t).toMatch(/reverse the conductor/i);
    expect(t).toMatch(/insulated conductors/);
  });
  it('a title with terminal escapes, NUL and CR is shown escaped, never acted on', () => {
    const t = textReport(analyse(designFrom('generic-sensor', (x) => { x.title = 'x\u001b[2J\u001b]0;owned\u0007\u0000\rdone'; }), { spreadTrials: 0 }));
    expect(t).not.toMatch(/[\u0000-\u0009\u000b-\u001f\u007f-\u009f]/);
    expect(t.split('\n')[0]).toBe('x\\u001b[2J\\u001b]0;owned\\u0007\\u0000\\u000ddone');
  });
});
