import { it } from 'vitest';
import { analyse } from '../src/analysis/report.js';
import { designFrom } from './helpers.js';
it('scratch', () => {
  for (const w of ['auto', 'single-pole', 'two-pole']) {
    const d = designFrom('bench-clamp', (x) => { x.target.ranges = [{ scale: 0.04, range: [-50, 50] }]; x.target.rangeSwitch = w; });
    const r = analyse(d, { spreadTrials: 0 });
    const rs = r.ranges!;
    if (!rs.ok) { console.log('not ok', rs); continue; }
    const v = rs.value;
    console.log(w, v.wiring, v.decidedBy, v.singlePoleShift, v.parts.map((p) => `${p.ref}:${p.role}:${p.ohms.toPrecision(4)}`).join(' '));
    for (const p of v.positions) {
      const q = p.report; if (!q) { console.log('unbuilt', p.index); continue; }
      console.log(' pos', p.index, 'scale', q.dc?.out[1], 'zero', q.dc?.out[0], 'shift', p.zeroShift, 'closed', p.zeroShiftClosedForm, 'resid', p.sharedTrimResidual, 'clip', q.clip?.measurandLow, q.clip?.measurandHigh, 'bw', q.speed?.smallSignal, 'noise', q.noise?.referredRms, 'err', q.errors?.afterTrim, p.parts.map((x) => x.ref).join(','), q.verdicts.filter(v=>v.level!=='pass').map(v=>v.title).join('|'));
    }
  }
});
