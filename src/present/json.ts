/**
 * The report as JSON ("gainwright-report", version 1): the figures as numbers (a non-finite one becomes
 * null), the findings with their code, level, words and data, the calibration steps and the cautions.
 * The format is documented in docs/design-format.md.
 */
import type { Report } from '../analysis/report.js';
import type { ClosedLoopSummary } from '../analysis/closed-loop.js';
import type { Part } from '../circuit/network.js';
import type { Topology } from '../model/design.js';
import { significantFigures } from '../model/eseries.js';
import { rkmCode } from '../model/units.js';
import { calibrationSteps } from './calibration.js';
import { cautionsFor } from './cautions.js';
import { findingTitle, sayFinding, topologyWhy } from './finding-words.js';
import { tradeJson } from './trade.js'; // issue 19
import { rangesJson } from './ranges.js'; // issue 19

/** The report as the CLI's JSON object ("gainwright-report", version 1). Non-finite numbers become null. */
export function reportJson(r: Report): Record<string, unknown> {
  const num = (x: number | null | undefined) => (x === null || x === undefined || !Number.isFinite(x) ? null : x);
  const s = r.stage;
  const part = (p: Part) => ({ ref: p.ref, role: p.role, ohms: p.kind === 'capacitor' ? null : p.ohms, ...(p.farads ? { farads: p.farads } : {}), series: p.series, tolerance: p.tolerance, arrangement: p.arrangement, code: p.kind === 'capacitor' ? '' : rkmCode(p.ohms, p.series === 'trimmer' || p.series === 'capacitor' ? 2 : significantFigures(p.series)), ...(p.setting !== undefined ? { setting: p.setting } : {}) });
  return {
    format: 'gainwright-report',
    version: 1,
    title: r.design.title,
    topology: (s?.ideal.topology ?? null) as Topology | null,
    topologyWhy: topologyWhy(r.choice),
    parts: s ? s.parts.map(part) : [],
    gain: num(s?.gain),
    noiseGain: num(s?.noiseGain),
    scale: num(r.dc?.out[1]),
    scaleError: num(s?.scaleError),
    zero: num(r.dc?.out[0]),
    reference: num(s?.reference),
    clip: r.clip ? { outputLow: num(r.clip.outputLow), outputHigh: num(r.clip.outputHigh), measurandLow: num(r.clip.measurandLow), measurandHigh: num(r.clip.measurandHigh), first: r.clip.first, firstLow: r.clip.firstLow, firstHigh: r.clip.firstHigh } : null,
    headroom: r.clip ? { low: num(r.clip.headroom.low), high: num(r.clip.headroom.high) } : null,
    bandwidth: r.speed ? { smallSignal: num(r.speed.smallSignal), fullPower: num(r.speed.fullPower), lowCorner: num(r.speed.lowCorner), riseTime: num(r.speed.riseTime), phaseAtCorner: num(r.speed.phaseAtCorner) } : null,
    noise: r.noise ? {
      densityAt1kHz: num(r.noise.densityAt1kHz), rms: num(r.noise.rms), band: r.noise.band, bandIsDefault: r.noise.bandIsDefault, referredRms: num(r.noise.referredRms), peakToPeak: num(r.noise.peakToPeak),
      lowFrequency: { band: r.noise.lowFrequency.band, rms: num(r.noise.lowFrequency.rms), peakToPeak: num(r.noise.lowFrequency.peakToPeak), referredPeakToPeak: num(r.noise.lowFrequency.referredPeakToPeak) },
    } : null,
    errors: r.errors ? { worstCase: num(r.errors.worstCase), rss: num(r.errors.rss), afterTrim: num(r.errors.afterTrim), afterTrimLow: num(r.errors.afterTrimLow), afterTrimHigh: num(r.errors.afterTrimHigh), at: num(r.errors.at) } : null,
    supply: r.supply ? { current: num(r.supply.current), batteryLife: num(r.supply.batteryLife) } : null,
    spread: r.spread ? { scaleStd: num(r.spread.scaleStd), zeroStd: num(r.spread.zeroStd), yield: num(r.spread.yield), trials: r.spread.trials } : null,
    drive: r.drive ? { scaleAt1M: num(r.drive.scaleAt1M), scaleAt50: num(r.drive.scaleAt50), drives50: r.drive.drives50, isolation: num(r.drive.isolation), probeRatio: r.drive.probeRatio, probeOffset: num(r.drive.probeOffset), probeOffsetShown: num(r.drive.probeOffsetShown), probeInvert: r.drive.probeInvert } : null,
    waveform: r.waveform ? {
      t: Array.from(r.waveform.t), measurand: Array.from(r.waveform.measurand), output: Array.from(r.waveform.output), ideal: Array.from(r.waveform.ideal),
      riseTime: num(r.waveform.riseTime), overshoot: num(r.waveform.overshoot), settlingTime: num(r.waveform.settlingTime), droop: num(r.waveform.droop),
      slewLimited: r.waveform.slewLimited, clipped: r.waveform.clipped,
    } : null,
    sensor: { sensitivity: num(r.front.sensitivity), figures: r.front.figures.map((f) => ({ key: f.key, label: f.label, value: num(f.value), unit: f.unit })) },
    battery: r.battery.map((b) => ({ voltage: b.voltage, measurandLow: num(b.measurandLow), measurandHigh: num(b.measurandHigh), headroomLow: num(b.headroomLow), headroomHigh: num(b.headroomHigh), zeroShift: num(b.zeroShift), scale: num(b.scale), regulated: b.regulated })),
    batteryClip: r.batteryClip ? { voltage: num(r.batteryClip.voltage), hoursToClip: num(r.batteryClip.hoursToClip), hoursToEnd: num(r.batteryClip.hoursToEnd) } : null,
    alternatives: s ? s.alternatives.map((a, i) => ({ index: i, feedback: a.a.parts, leg: a.b.parts, error: num(a.error), parts: a.parts })) : [],
    calibration: calibrationSteps(r).map((c) => c.text),
    warnings: r.warnings.map((w) => ({ code: w.code, level: w.level, title: findingTitle(w.code), message: sayFinding(w), data: w.data })),
    cautions: cautionsFor(r.design.sensor.type, r.front.cautions),
    absent: r.absent,
    // --- closed-loop Hall sensor (issue #20) ---
    ...(r.closedLoop ? { closedLoop: closedLoopJson(r.closedLoop, num) } : {}),
    // Issue 19: the turns trade ([] unless asked for) and the range switch (each position; the first = the figures above).
    trade: tradeJson(r.trade),
    ...rangesJson(r.ranges),
  };
}

// --- closed-loop Hall sensor (issue #20) ---
/** A closed-loop sensor's summary as JSON (`closedLoop` in the report): the step, the supply at the range end, the turns trade. */
function closedLoopJson(c: ClosedLoopSummary, num: (x: number | null | undefined) => number | null): Record<string, unknown> {
  return {
    step: c.step ? { step: num(c.step.step), ideal: num(c.step.ideal), overshoot: num(c.step.overshoot), sag: num(c.step.sag), settlingTime: num(c.step.settlingTime), tailRipple: num(c.step.tailRipple), crossings: c.step.crossings } : null,
    supplyAtZero: num(c.supplyAtZero), supplyAtRangeEnd: num(c.supplyAtRangeEnd), batteryLifeAtZero: num(c.batteryLifeAtZero), batteryLifeAtRangeEnd: num(c.batteryLifeAtRangeEnd),
    trade: c.trade.map((o) => ({
      turns: o.turns, measurementResistance: num(o.measurementResistance), sensitivity: num(o.sensitivity), windingResistance: num(o.windingResistance), inductance: num(o.inductance),
      supplyCurrent: num(o.supplyCurrent), maxCurrent: num(o.maxCurrent), windingCorner: num(o.windingCorner), tail: num(o.tail), crossover: num(o.crossover), phaseMargin: num(o.phaseMargin), fits: o.fits,
      compensation: { inputResistance: o.compensation.inputResistance, capacitance: o.compensation.capacitance, zeroResistance: o.compensation.zeroResistance, dip: num(o.compensation.dip) },
    })),
    proposal: c.proposal ? c.proposal.turns : null,
  };
}
// --- end closed-loop Hall sensor ---
