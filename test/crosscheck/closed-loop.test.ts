/**
 * The closed-loop Hall sensor alone against ngspice (Debian package `ngspice`, an independent simulator), on
 * the netlist `gainwright report --spice-sensor` exports, run unmodified with `ngspice -b`: the transfer
 * V(sens)/I_p across the hand-over from the Hall path to the transformer path (two decades either side of the
 * winding's corner and the loop's crossover), and a step of primary current that settles without sustained
 * ringing. The stage with the sensor in front of it is cross-checked with the other designs (spice.test.ts).
 * Tolerances: transfer 0.1 % and 0.1°; the step within 0.5 % of the edge at every sample.
 */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { closedLoopSpiceNetlist } from '../../src/present/spice-closed-loop.js';
import { closedLoopParts, closedLoopFigures } from '../../src/physics/closed-loop.js';
import { circuitTransferAt, closedLoopCircuit } from '../../src/circuit/closed-loop.js';
import { closedLoopStep } from '../../src/analysis/closed-loop.js';
import { interpolate } from '../../src/circuit/transient.js';
import type { ClosedLoopHallSensor } from '../../src/model/design.js';
import { CLOSED_LOOP_DESIGNS } from './designs.js';

const hasNgspice = spawnSync('sh', ['-c', 'command -v ngspice'], { stdio: 'ignore' }).status === 0;
if (!hasNgspice && process.env.CI === 'true') throw new Error('ngspice is required under CI=true (apt-get install -y ngspice)');

const rows = (path: string) => readFileSync(path, 'utf8').trim().split('\n').slice(1).map((l) => l.trim().split(/\s+/).map(Number));

describe.skipIf(!hasNgspice)('closed-loop Hall sensor alone against ngspice', () => {
  it.each(CLOSED_LOOP_DESIGNS())('%s', (name, design) => {
    const s = design.sensor as ClosedLoopHallSensor;
    const ex = closedLoopSpiceNetlist(design, { date: '2026-12-02' })!;
    const dir = mkdtempSync(join(tmpdir(), 'gw-cl-'));
    writeFileSync(join(dir, 'sensor.cir'), ex.netlist);
    const run = spawnSync('ngspice', ['-b', 'sensor.cir'], { cwd: dir, encoding: 'utf8', timeout: 120_000 });
    const errs = `${run.stdout}\n${run.stderr}`.split('\n').filter((l) => /error|aborted|singular|timestep too small/i.test(l));
    expect(errs, name).toEqual([]);

    // The transfer across the hand-over, magnitude and phase, against the report's circuit.
    const p = closedLoopParts(s, design.supply);
    const cc = closedLoopCircuit(s, p);
    const fig = closedLoopFigures(s, design.supply, 20);
    const ac = rows(join(dir, 'gainwright-cl-ac.txt'));
    let worstMag = 0, worstPh = 0;
    for (const [f, m, ph] of ac) {
      const [re, im] = circuitTransferAt(cc, f!);
      worstMag = Math.max(worstMag, Math.abs(m! / Math.hypot(re, im) - 1));
      worstPh = Math.max(worstPh, Math.abs(ph! - Math.atan2(im, re)) * 180 / Math.PI);
    }
    console.log(`${name}: transfer over ${ac.length} frequencies, worst |H| ${(worstMag * 100).toPrecision(2)} %, phase ${worstPh.toPrecision(2)}°`);
    expect(worstMag).toBeLessThan(1e-3);
    expect(worstPh).toBeLessThan(0.1);
    // The sweep spans the crossover and the winding's corner, and the dip there is the report's.
    expect(ac[0]![0]!).toBeLessThan(Math.min(fig.loop.windingCorner, fig.loop.crossover!));
    expect(ac[ac.length - 1]![0]!).toBeGreaterThan(Math.max(fig.loop.windingCorner, fig.loop.crossover!));
    const ideal = fig.idealSensitivity;
    const dip = Math.min(...ac.map((r) => r[1]! / ideal - 1));
    expect(Math.abs(dip - Math.min(0, fig.loop.flatness))).toBeLessThan(0.002);

    // The step: same trace as the report's time-domain solve, and no sustained ringing in ngspice's.
    const st = closedLoopStep(s, design.supply, ex.step)!;
    const tr = rows(join(dir, 'gainwright-cl-tran.txt'));
    const ts = tr.map((r) => r[0]! - ex.stepAt), vs = tr.map((r) => r[1]! - p.reference);
    let worst = 0;
    for (let k = 0; k < st.t.length; k += 5) {
      if (Math.abs(st.t[k]!) < 1e-9 * ex.stop) continue;
      worst = Math.max(worst, Math.abs(interpolate(ts, vs, st.t[k]!) - st.output[k]!));
    }
    console.log(`${name}: step of ${ex.step} A, worst difference ${(worst / Math.abs(st.ideal) * 100).toPrecision(2)} % of the edge; report: overshoot ${st.overshoot.toPrecision(2)}, sag ${st.sag.toPrecision(2)}, crossings ${st.crossings}`);
    expect(worst / Math.abs(st.ideal)).toBeLessThan(0.005);
    const settled = vs[vs.length - 1]!;
    expect(Math.abs(settled / st.ideal - 1)).toBeLessThan(0.002);
    const last = vs.filter((_, k) => ts[k]! > 0.75 * (ex.stop - ex.stepAt));
    const ripple = Math.max(...last.map((v) => Math.abs(v - settled))) / Math.abs(st.ideal);
    expect(ripple, 'no sustained ringing').toBeLessThan(0.001);
    let crossings = 0;
    for (let k = 1; k < vs.length; k++) if (ts[k]! > 0 && Math.sign(vs[k]! - settled) !== Math.sign(vs[k - 1]! - settled) && Math.abs(vs[k]! - settled) > 1e-6 * Math.abs(st.ideal)) crossings++;
    expect(crossings, 'crossings of the settled value').toBeLessThanOrEqual(3);
  });
});
