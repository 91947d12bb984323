import { it } from 'vitest';
import { analyse } from '../src/analysis/report.js';
import { designForRange } from '../src/analysis/ranges.js';
import { designFrom } from './helpers.js';
it('scratch', () => {
  const d = designFrom('bench-clamp', (x) => { x.target.ranges = [{ scale: 0.025, range: [-80, 80] }]; x.target.rangeSwitch = 'single-pole'; });
  const r = analyse(d, { spreadTrials: 0 });
  const v = (r.ranges as any).value;
  const p = v.positions[1];
  console.log(JSON.stringify(p.report.warnings.map((w: any) => w.code + ': ' + w.message)), p.report.absent);
  const d2 = designForRange(d, 1);
  const r2 = analyse(d2, { spreadTrials: 0 });
  console.log(r2.choice.why, r2.stage?.network.feedback, r2.stage?.network.reference.voltage, r2.dc?.out);
});
