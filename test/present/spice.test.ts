import { describe, expect, it } from 'vitest';
import { spiceNetlist } from '../../src/present/spice.js';
import { analyse } from '../../src/analysis/report.js';
import { designFrom } from '../helpers.js';

describe('SPICE netlist', () => {
  const r = analyse(designFrom('generic-sensor'), { spreadTrials: 0 });
  const net = spiceNetlist(r, { date: '2026-12-01' })!;
  it('starts with the title, an ISO 8601 date and the model assumptions', () => {
    const head = net.split('\n').slice(0, 8).join('\n');
    expect(head).toMatch(/^\* Gainwright netlist: Generic 12\.5 mV\/A sensor/);
    expect(head).toMatch(/2026-12-01 \(ISO 8601\)/);
    expect(head).toMatch(/Model assumptions/);
  });
  it('holds every fixed part at its value and both halves of each trimmer at its setting', () => {
    for (const p of r.stage!.parts.filter((x) => x.kind === 'resistor')) expect(net).toMatch(new RegExp(`^${p.ref} \\S+ \\S+ ${p.ohms}$`, 'm'));
    const zt = r.stage!.parts.find((p) => p.role === 'zero-trim')!;
    const halves = [...net.matchAll(new RegExp(`^${zt.ref}[AB] \\S+ \\S+ (\\S+)`, 'gm'))].map((m) => Number(m[1]));
    // The halves add up to the track, to the netlist's printing precision.
    expect(Math.abs(halves.reduce((a, b) => a + b, 0) / zt.ohms - 1)).toBeLessThan(1e-8);
    expect(net).toMatch(/^RLOAD \S+ 0 1000000$/m);
    expect(net).toMatch(/^\.end$/m);
  });
  it('a title cannot break out of its comment line', () => {
    const r2 = analyse({ ...r.design, title: 'x\n.include /etc/passwd' }, { spreadTrials: 0 });
    const n2 = spiceNetlist(r2)!;
    expect(n2).not.toMatch(/^\.include/m);
  });
  it('no text from the design leaves its comment line: every line is a comment, a directive or an element we wrote', () => {
    // Issue 14: a measurand with a newline wrote live lines (.inc, shell inside .control). The measurand is now
    // validated as a unit symbol; the netlist writer is the second guard, tested here with a report built
    // around validation.
    const evil = 'A\n.inc other.cir\r\nshell touch x\u2028.end';
    const r3 = analyse({ ...r.design, title: evil, sensor: { ...r.design.sensor, measurand: evil } }, { spreadTrials: 0 });
    const n3 = spiceNetlist(r3)!;
    expect(n3).not.toMatch(/^\.inc /m);
    expect(n3).not.toMatch(/^shell/m);
    expect(n3).not.toMatch(/[\r\u2028]/);
    const own = /^(\*|\.(temp|nodeset|control|endc|end)\b|[RCLVIEGB][A-Za-z0-9_]* |set |op$|wrdata |dc |ac |noise |setplot |quit$)/;
    for (const line of n3.trimEnd().split('\n')) expect(line, line).toMatch(own);
  });
});
