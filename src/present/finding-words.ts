/**
 * The one wording module for findings: each finding code's title and sentence, each limit's plain name and
 * reason, each stage reason. The core hands over codes and numbers (`src/model/findings.ts`); only this
 * module turns them into words, so a sentence is changed in one place and nothing parses a label back.
 * `FINDING_WORDS` is typed over every code: the build fails when a code has no title or sentence.
 */
import type { Finding, FindingCode, FindingData, LimitCause, LimitData, StageGuidance, StageReason } from '../model/findings.js';
import { formatEng } from '../model/units.js';
import { STAGE_NAMES } from './words.js';
import type { Topology } from '../model/design.js';

const f3 = (x: number, unit = '') => formatEng(x, unit, 3);
/** Three significant figures, plain (no prefix): `1.23`. */
const p3 = (x: number) => (Number.isFinite(x) ? Number(x.toPrecision(3)).toString() : '—');
/** Ohms in a short form: `4.7 kΩ`. */
const ohms = (x: number) => {
  const [m, u] = ([[1e6, 'MΩ'], [1e3, 'kΩ'], [1, 'Ω']] as const).find(([m]) => x >= m) ?? [1, 'Ω'];
  return `${+(x / m).toPrecision(3)} ${u}`;
};
const pct = (x: number, digits: number) => `${(x * 100).toFixed(digits)} %`;
const stageName = (t: string) => STAGE_NAMES[t as Topology] ?? t;

/** Each limit's plain name, for the verdict lines. */
export const LIMIT_NAMES: Record<LimitCause, string> = {
  'opamp-output': 'the op-amp output reaches its swing',
  'opamp-current': 'the op-amp output current limit',
  'opamp-input': 'the op-amp inputs leave their range',
  sensor: 'the sensor reaches its limit',
  core: 'the core saturates',
  burden: 'the burden or shunt reaches its power rating',
  driver: 'the compensation driver runs out and the core leaves zero flux',
};

/** Why a limit bounds the linear range, in words: `the op-amp output swings only from 0.05 V to 7.5 V`. */
export function limitWhy(l: LimitData): string {
  switch (l.cause) {
    case 'opamp-output': return `the op-amp output swings only from ${+l.low.toFixed(3)} V to ${+l.high.toFixed(3)} V`;
    case 'opamp-current': return `the op-amp can drive only ±${+(l.current * 1e3).toPrecision(6)} mA into the feedback network and load`;
    case 'opamp-input': return `the op-amp inputs must stay within ${+l.low.toFixed(3)} V … ${+l.high.toFixed(3)} V`;
    case 'sensor':
      if (l.what === 'output') return `the sensor's output reaches its ${p3(l.low)}…${p3(l.high)} V limits`;
      if (l.what === 'hall-linear') return `the Hall sensor is linear only to ±${p3(l.field)} T`;
      return `the readings leave the straight line ${l.low !== null && l.high !== null ? `below ${p3(l.low)} and above ${p3(l.high)} ${l.measurand}` : l.high !== null ? `above ${p3(l.high)} ${l.measurand}` : `below ${p3(l.low ?? NaN)} ${l.measurand}`}`;
    case 'core': return `the core saturates at ${p3(l.saturation)} T`;
    case 'burden': return `the ${l.part} reaches its ${p3(l.power)} W rating`;
    case 'driver': return `the compensation driver runs out of ${l.runsOut === 'current' ? 'current' : 'voltage'} and the core leaves zero flux (the output stops rising; the core saturates at ${p3(l.saturation)} ${l.measurand})`;
  }
}

/** What a person can change when a limit clips inside the range (empty when nothing general applies). */
function limitFix(l: LimitData | null): string {
  switch (l?.cause) {
    case 'opamp-output': case 'opamp-current': return ' To fit, move the zero towards the middle of the swing, lower the scale, use a split supply, or an op-amp whose output swings closer to the rails.';
    case 'opamp-input': return ' An op-amp whose input range includes the rail, a lower sensor offset, or the inverting stage (its inputs sit still) would fit.';
    case 'core': return ' Fewer turns or a longer gap raise the core\'s limit.';
    case 'driver': return ' A smaller measurement resistor, more compensation turns, wider rails or a driver with more current (a push-pull pair) hold more.';
    case 'sensor': return ' The sensor itself runs out first: fewer turns, a longer gap, or a sensor with a wider range.';
    default: return '';
  }
}

const INPUTS_WHAT: Record<Extract<StageReason, { code: 'inputs-outside' }>['what'], string> = {
  'follow-sensor': 'the inputs follow the sensor',
  sit: 'the inputs sit',
  'sit-ground': 'the inputs sit at ground,',
  'follow-sum': 'the inputs follow the summed sensor and reference',
};
const FITS: Record<Extract<StageReason, { code: 'fits' }>['how'], string> = {
  'unity-buffer': 'a unity buffer: the target equals the sensor\'s own scale and zero',
  'non-inverting': 'keeps the sensor\'s polarity with a gain of at least 1 and loads the sensor only with the op-amp input',
  'inverting-attenuates': 'an inverting stage can attenuate, which the target needs',
  inverting: 'an inverting stage gives the opposite polarity the target asks for, with its inputs at a fixed voltage',
  'summing-inverting': 'sums the sensor and a rail into the − input: opposite polarity with an offset of the same sign',
  'difference-differential': 'reads the sensor\'s differential output and rejects its common-mode voltage',
  difference: 'takes the sensor between its two terminals, with the zero set by the reference',
  'summing-attenuates': 'keeps the sensor\'s polarity and can attenuate, with the offset summed in at the + input',
  'summing-non-inverting': 'keeps the sensor\'s polarity with an offset of the same sign, summed in at the + input',
};

/** One reason a stage was or was not taken, in words. */
export function stageReasonWords(r: StageReason): string {
  switch (r.code) {
    case 'polarity-inverted-ac': return 'the output is inverted (180° phase), which does not matter for an rms reading';
    case 'polarity-wrong': return r.keeps
      ? 'a non-inverting stage keeps the sensor\'s polarity, and the target asks for the opposite sign'
      : 'an inverting stage flips the sensor\'s polarity, and the target asks for the same sign';
    case 'differential-needs-difference': return 'the sensor\'s output is differential (its − terminal is not at ground): only the difference stage reads it';
    case 'inputs-outside': return `${INPUTS_WHAT[r.what]} ${r.low === r.high ? `at ${r.low.toPrecision(3)} V` : `from ${r.low.toPrecision(3)} to ${r.high.toPrecision(3)} V`}, outside the op-amp's input range ${r.inputLow.toPrecision(3)}…${r.inputHigh.toPrecision(3)} V`;
    case 'cannot-attenuate': return `a non-inverting stage cannot attenuate: the target needs a gain of ${r.gain.toPrecision(3)}`;
    case 'buffer-zero-fixed': return `a unity-gain buffer keeps the sensor's ${p3(r.sensorZero)} V zero and cannot move it to ${r.wanted.toPrecision(4)} V`;
    case 'reference-outside': return r.node === 'plus-input'
      ? `the + input would have to sit at ${r.voltage.toPrecision(3)} V, outside the ${p3(r.railLow)}…${p3(r.railHigh)} V it can be taken from`
      : `the reference would have to be ${r.voltage.toPrecision(3)} V, outside the ${p3(r.railLow)}…${p3(r.railHigh)} V it can be taken from`;
    case 'no-offset': return r.plain === 'non-inverting'
      ? 'with no offset to add, this is the plain non-inverting stage'
      : 'with no offset to add, this is the plain inverting stage with its + input grounded';
    case 'no-rail-for-offset': return `the offset ${r.offset.toPrecision(3)} V needs a ${r.polarity} rail to sum in, and there is none`;
    case 'no-gain': return 'the target asks for no gain at all';
    case 'fits': return FITS[r.how];
  }
}

/** Guidance when no stage fits, in words. */
export function guidanceWords(g: StageGuidance): string {
  switch (g.code) {
    case 'polarity-cause': return `The polarity is the cause, not the rails: a ${stageName(g.topology)} stage gives an output that ${g.rises ? 'rises' : 'falls'} as the ${g.measurand} rises, and the wanted scale asks for the opposite sign. Reverse the conductor through the sensor (or turn the sensor round) to flip its sign, change the scale's sign, or choose the ${g.other === 'other' ? 'other' : stageName(g.other)} stage (or let Gainwright choose).`;
    case 'attenuate-same-polarity': return 'The target needs attenuation with the sensor\'s own polarity: reverse the conductor through the sensor (or swap the sensor\'s orientation) to flip its sign, then an inverting stage can attenuate.';
    case 'check-rails': return 'Check that the rails leave room for the reference and for the op-amp\'s input range; a rail-to-rail input op-amp or a wider supply may be needed.';
  }
}

/** Why the chosen stage (or none) was taken: `non-inverting: keeps the sensor's polarity …`. */
export function topologyWhy(choice: { chosen: { topology: string; reasons: StageReason[] } | null; considered: { topology: string; reasons: StageReason[] }[] }): string {
  const line = (c: { topology: string; reasons: StageReason[] }) => `${c.topology}: ${c.reasons.map(stageReasonWords).join('; ')}`;
  return choice.chosen ? line(choice.chosen) : `no single-stage topology fits: ${choice.considered.map(line).join(' | ')}`;
}

/** The compensation a closed-loop finding suggests, in words. */
const COMP = (d: { inputResistance: number; capacitance: number; zeroResistance: number }) => `R_i ${ohms(d.inputResistance)}, C_i ${f3(d.capacitance, 'F')} with R_z ${ohms(d.zeroResistance)} in series (the zero on the winding's corner)`;

type Words = { [K in FindingCode]: { title: string; say: (d: FindingData[K]) => string } };

const SOURCE_FROM = { regulated: 'the regulated rail', battery: 'the battery', positive: 'the positive rail' } as const;
const SERIES_FIX = 'widen the resistance window, allow two-part arms, or choose a finer series';

/** Every finding's title (as a verdict line heads it) and sentence. */
export const FINDING_WORDS: Words = {
  'fringing-model': {
    title: 'Fringing modelled',
    say: (d) => d.from === 'factor'
      ? `Fringing: the gap's effective area is taken as ${p3(d.areaRatio)} × the core's cross-section (the fringing factor given). The same area sets the core flux and the field the sensor reads, taken as the gap's mean flux density; calibrate against a known current.`
      : `Fringing: the gap's effective area is the core's cross-section${d.from === 'square-section' ? ' (taken as square)' : ''} with the gap length added to each side, ${p3(d.areaRatio)} × the core's area (Fitzgerald & Kingsley form). The same area sets the core flux (the core carries ${p3(d.areaRatio)} × the gap's mean flux density, so it saturates at that much less current) and the field the sensor reads, taken as the gap's mean flux density; calibrate against a known current.`,
  },
  'fringing-neglected': { title: 'Fringing neglected', say: () => 'Fringing is neglected (fringing factor 1): the gap field is B = μ0·N·I/(g + l/μr) and the core carries the same flux density. Real fringing raises the core flux for the same current; give the core\'s cross-section (the core cross-section at the gap: width and depth) to model it, and calibrate against a known current.' },
  remanence: { title: 'Re-zero after an overload', say: () => 'An overload can leave the core magnetised and shift the zero: re-zero after any overload.' },
  'earth-field': { title: 'The Earth\'s field reads', say: (d) => `The Earth's field alone reads as about ${p3(d.reading)} ${d.measurand}: zero the probe where it will be used.` },
  'gap-critical': { title: 'Gap is critical', say: (d) => `Sensitivity changes by ${(d.changePerTenthMm * 100).toFixed(1)} % for each 0.1 mm of gap: a hand-cut gap will need the span trimmer.` },
  'burden-power': { title: 'Burden overloaded', say: (d) => `The burden dissipates ${p3(d.power)} W at the top of the range, above its ${p3(d.rating)} W rating.` },
  'ct-no-dc': { title: 'A current transformer passes no DC', say: () => 'A current transformer passes no DC: set the signal to AC (rms), or use a Hall sensor or a shunt for DC.' },
  'low-side-only': { title: 'Shunt in the low side', say: () => 'The shunt sits in the low side, on the amplifier ground; for a shunt in the high side give its supply-end voltage (the High side: supply-end voltage field) and use the difference stage.' },
  'shunt-power': { title: 'Shunt overloaded', say: (d) => `The shunt dissipates ${p3(d.power)} W at the range end, above its ${p3(d.rating)} W rating.` },
  // --- closed-loop Hall sensor (issue #20) ---
  'closed-loop-unstable': { title: 'The sensor loop is unstable', say: (d) => `The compensation loop is unstable (phase margin ${d.phaseMargin === null ? 'none' : `${p3(d.phaseMargin)}°`}): the output will oscillate. Try ${COMP(d)}.` },
  'closed-loop-margin': { title: 'The sensor loop rings', say: (d) => `The compensation loop's phase margin is ${p3(d.phaseMargin)}° at ${f3(d.crossover, 'Hz')}: a step will ring. Try ${COMP(d)}.` },
  'closed-loop-flatness': { title: 'The response steps at the hand-over', say: (d) => `The response steps by ${pct(d.flatness, 1)} at ${f3(d.at, 'Hz')}, where the Hall path hands over to the transformer path. A zero in the compensation flattens it: ${COMP(d)} leaves ${pct(d.dip, 1)}.` },
  'closed-loop-flatness-limit': { title: 'The response steps a little at the hand-over', say: (d) => `The response steps by ${pct(d.flatness, 1)} at ${f3(d.at, 'Hz')}, where the Hall path hands over to the transformer path: about what a 60° phase margin allows with this Hall sensor's bandwidth and this driver's gain-bandwidth. A faster driver or Hall sensor flattens it.` },
  'closed-loop-overload': { title: 'Past the held current', say: (d) => `Past ${p3(d.high)} ${d.measurand} (or ${p3(d.low)} ${d.measurand}) the driver runs out of ${d.limitHigh === 'current' ? 'current' : 'voltage'}: the core is no longer held at zero flux, the output stops rising and reads low, the core saturates at ${p3(d.saturationHigh)} ${d.measurand} and the output collapses. Re-zero after any overload (the core may stay magnetised).` },
  'closed-loop-residual': { title: 'Scale error of the finite loop gain', say: (d) => `The loop's DC gain of ${p3(d.dcLoopGain)} leaves a scale error of ${pct(d.residual, 4)} (included in the sensitivity).` },
  'closed-loop-polarity': { title: 'Winding polarity', say: () => 'If the voltage across the measurement resistor sits at a rail at power-up with no current flowing, the compensation winding is connected the wrong way round: switch off and swap its two leads.' },
  'closed-loop-unmodelled': { title: 'The transformer path\'s upper end is not modelled', say: () => 'The transformer path is modelled with perfect coupling: the winding\'s own capacitance and the core\'s losses, which end it at high frequency, are not modelled.' },
  'closed-loop-driver-current': { title: 'The driver cannot supply the range', say: (d) => `The range end needs ${f3(d.need, 'A')} from the driver, more than its ${f3(d.limit, 'A')} limit: more turns, or a push-pull output stage.` },
  // --- end closed-loop Hall sensor ---
  'readings-too-few': {
    title: 'Too few sensor readings to fit',
    say: (d) => d.allAtOneValue
      ? `The sensor readings are all at one ${d.measurand} value: take readings at three or more different values; the datasheet figures are used meanwhile.`
      : `The sensor readings give ${d.have} usable point${d.have === 1 ? '' : 's'}; a fit needs at least ${d.need} (${d.need - d.have} more, at different ${d.measurand} values): the datasheet figures are used meanwhile.`,
  },
  'readings-implausible': { title: 'Sensor readings do not fit this core', say: (d) => `The readings imply a fringing factor of ${d.fringing.toPrecision(3)} for this core, outside ${p3(d.low)}…${p3(d.high)}: check the turns, the Hall sensitivity and the sign of the readings; the datasheet figures are used meanwhile.` },
  'buffer-no-trim': {
    title: 'Nothing to trim',
    say: (d) => d.stage === 'unity'
      ? 'A unity buffer has no gain or zero to trim; the sensor\'s own scale and zero pass straight through.'
      : 'The stage is a follower of the summed input (K = 1): there is no feedback arm to trim the span with; the sensor\'s spread passes through.',
  },
  'gain-beyond-loop': { title: 'Gain beyond the op-amp', say: (d) => `A gain of ${d.gain.toPrecision(4)} is beyond what the op-amp's open-loop gain (${p3(d.openLoopGainDb)} dB) can hold: use two stages or an op-amp with more open-loop gain.` },
  'gain-unrealisable': {
    title: 'No resistor network gives the gain',
    say: (d) => d.with === 'window' || d.gain === null
      ? `No ${d.series} part lies within the resistance window: widen it.`
      : `No network of ${d.series} parts within ${ohms(d.windowLow)}…${ohms(d.windowHigh)} gives ${d.with === 'offset' ? 'this stage ' : ''}a gain of ${d.gain.toPrecision(4)} with the ${d.with} it needs: ${SERIES_FIX}.`,
  },
  'reference-unrealisable': { title: 'No reference network', say: (d) => `No reference network of ${d.series} parts within ${ohms(d.windowLow)}…${ohms(d.windowHigh)} gives the ${d.reference.toPrecision(3)} V this stage needs: widen the resistance window or choose a finer series.` },
  'scale-off-target': { title: 'Scale off target', say: (d) => `The nearest network of ${d.series} parts gives a scale ${(d.error * 100).toFixed(3)} % off target, more than the ${(d.accept * 100).toFixed(2)} % a ${(d.tolerance * 100).toFixed(1)} % part tolerance allows: ${SERIES_FIX}.` },
  'zero-off-target': {
    title: 'Zero off target',
    say: (d) => `The nearest ${d.networks ? 'networks' : 'reference divider'} of ${d.series} parts put${d.networks ? '' : 's'} the zero ${(d.error * 1e3).toPrecision(3)} mV off at the output, more than 0.1 % of the ${(d.span * 1e3).toPrecision(3)} mV the range spans there${d.zeroTrim ? ', and no zero trimmer can centre on a reference this near a rail' : ''}: ${d.zeroTrim ? 'move the zero away from where the reference meets the rail, or widen the range' : 'allow a zero trimmer'}, allow two-part arms, or choose a finer series.`,
  },
  'gain-trim-short': {
    title: 'Span trimmer cannot cover the spread',
    say: (d) => d.cause === 'none-fits'
      ? d.leverage !== null
        ? `No standard gain trimmer fits this feedback network (near unity gain the span trim has little leverage, (G−1)/G = ${d.leverage.toFixed(3)}), so the span is set by the parts alone: calibrate the scale at the instrument, or pick more gain and a smaller sensor sensitivity.`
        : 'No standard gain trimmer fits this feedback network, so the span is set by the parts alone: calibrate the scale at the instrument.'
      : `The gain trimmer covers ±${pct(d.halfSpan, 2)}, less than ${d.coverage} × the ±${pct(d.stack, 2)} worst-case stack.${d.nearUnityLeverage !== null ? ` Near unity gain the span trim has little leverage ((G−1)/G = ${d.nearUnityLeverage.toFixed(2)}): pick a sensor setup with less spread, or more gain and a smaller sensitivity (fewer turns, a longer gap).` : ''}`,
  },
  'kit-quantity': { title: 'Kit runs short of a value', say: (d) => `The parts list takes ${d.used} × ${formatEng(d.ohms, 'Ω')}, and the kit holds ${d.held}: buy ${d.used - d.held} more, or raise the kit's count if you have them.` },
  'kit-short': {
    title: 'The kit cannot meet the target',
    say: (d) => {
      const off = (e: number | null) => (e === null ? 'no network' : `${(Math.abs(e) * 100).toFixed(3)} % off`);
      const close = d.error === null ? 'No network can be built from the kit' : `From the kit the nearest network is ${off(d.error)} the wanted scale`;
      const buy = !d.buy ? 'No single value of the next series helps: widen the resistance window, allow two-part arms, or fit a span trimmer.'
        : d.buy.meets ? `Buy ${d.buy.uses > 1 ? `${d.buy.uses} × ` : ''}${formatEng(d.buy.ohms, 'Ω')} (${d.buy.series}): with it the kit meets the target (${off(d.buy.error)}).`
        : `No single value of ${d.buy.series} meets it; the one that helps most is ${formatEng(d.buy.ohms, 'Ω')}, which brings it to ${off(d.buy.error)}.`;
      return `${close}${d.accept === null ? '' : `, more than the ${(d.accept * 100).toFixed(2)} % the solver accepts`}. ${buy}`;
    },
  },
  'zero-by-wire': { title: 'Leg tied to ground', say: (d) => `The reference is ground itself, so the leg is tied to it with no divider and no zero trimmer: what remains is the op-amp's offset, about ±${(d.offsetAtOutput * 1e3).toPrecision(2)} mV at the output; null it at the instrument.` },
  'zero-trim-short': {
    title: 'Zero trimmer cannot cover the spread',
    say: (d) => d.cause === 'near-rail'
      ? `No standard zero trimmer covers ${d.coverage} × the worst-case zero stack from a reference this near a rail, so the divider is fixed: null the zero at the instrument, or move the zero.`
      : d.summed
        ? `The offset comes straight from the ${p3(d.rail)} V rail, where a trimmer cannot straddle it: null the zero at the instrument, or choose a zero that needs a reference between the rails.`
        : `The zero needs the reference on the rail itself (${p3(d.rail)} V), where a trimmer cannot straddle it, so the leg is tied to the rail: null the zero at the instrument, or choose a zero away from the rail.`,
  },
  'zero-trim-off-centre': { title: 'Zero trimmer starts off centre', say: (d) => `The reference sits near a rail, so the zero trimmer starts at ${(d.setting * 100).toFixed(0)} % of its travel.` },
  'gain-not-computable': { title: 'Gain cannot be computed', say: () => 'The gain cannot be computed, because the wanted scale divided by the sensor\'s sensitivity is beyond any number: check both for a slipped prefix or exponent.' },
  'no-topology': { title: 'No stage fits', say: (d) => `No stage fits: ${topologyWhy({ chosen: null, considered: d.considered })}.` },
  guidance: { title: 'What would fit', say: (d) => guidanceWords(d) },
  singular: { title: 'Circuit has no solution', say: () => 'The circuit has no unique solution; check for a part of zero or infinite value.' },
  'ac-peak': { title: 'Headroom at the sine peak', say: (d) => `The range is rms: headroom is checked at the sine peak, ±${f3(d.peak, d.measurand)} (√2 × rms).` },
  'not-linear-at-zero': { title: 'Never linear', say: (d) => `No ${d.measurand} value keeps the stage linear: ${d.limit ? limitWhy(d.limit) : 'a limit is exceeded'}.` },
  'zero-outside-linear': { title: 'Zero outside the linear region', say: (d) => `At zero ${d.measurand} the stage sits outside its linear region, which runs from ${f3(d.low, d.measurand)} to ${f3(d.high, d.measurand)}${d.coversRange ? ' and covers the range' : ''}.` },
  'clips-in-range-low': { title: 'Clips inside the range (low end)', say: (d) => `The output saturates at ${f3(d.at, d.measurand)}, inside the wanted range (${f3(d.wanted, d.measurand)}): ${d.limit ? limitWhy(d.limit) : 'a limit is reached'}.${limitFix(d.limit)}` },
  'clips-in-range-high': { title: 'Clips inside the range (high end)', say: (d) => `The output saturates at ${f3(d.at, d.measurand)}, inside the wanted range (${f3(d.wanted, d.measurand)}): ${d.limit ? limitWhy(d.limit) : 'a limit is reached'}.${limitFix(d.limit)}` },
  'bandwidth-short': { title: 'Bandwidth short of the target', say: (d) => `The chain's bandwidth is ${f3(d.bandwidth, 'Hz')}, below the ${f3(d.wanted, 'Hz')} wanted.` },
  'slew-limited': { title: 'Slew-limited at full scale', say: (d) => `Full-scale signals are slew-limited above ${f3(d.fullPower, 'Hz')} (SR/(2π·Vpeak)); the wanted range and ${f3(d.wanted, 'Hz')} cannot both be had.` },
  'ac-low-frequency': { title: 'Reads low at 50 Hz', say: (d) => `At ${+d.frequency.toPrecision(3)} Hz the reading is ${(d.shortfall * 100).toFixed(2)} % below the passband scale and leads by ${d.leadDegrees.toFixed(1)}° (low corner ${f3(d.lowCorner, 'Hz')}); below about ${f3(d.lowCorner * 7, 'Hz')} it reads more than 1 % low.` },
  'sensor-drive': { title: 'Sensor cannot drive the input', say: (d) => `The amplifier's input network draws up to ${f3(d.draw, 'A')} from the sensor, more than the ${f3(d.drive, 'A')} it can drive.` },
  'sensor-load': { title: 'Load on the sensor', say: (d) => `The input network draws up to ${f3(d.draw, 'A')} from the sensor's output${d.drive > 0 ? ` (it can drive ${f3(d.drive, 'A')})` : '; check that the sensor can drive it'}.` },
  'flicker-not-given': { title: '1/f noise corner not given', say: (d) => `The op-amp's 1/f noise corner${d.voltage && d.current ? 's are' : ' is'} not given (0 Hz): its noise is taken as white down to ${f3(d.from, 'Hz')}, right for a chopper, optimistic for most other kinds. Give the op-amp's voltage and current noise 1/f corners from its noise curve.` },
  'common-mode': { title: 'Common-mode error', say: (d) => `The sensor's ${f3(d.commonMode, 'V')} common mode: the built pair passes ${f3(d.passed, 'V')} of it (${f3(d.passedReferred, d.measurand)}), and ${(d.tolerance * 100).toFixed(1)} % resistors can pass up to ${f3(d.worst, 'V')} (${f3(d.worstReferred, d.measurand)}, a common-mode gain of ${d.worstGain.toPrecision(2)}): the zero trim removes it at this common mode; a common mode that moves moves the zero by as much.` },
  'probe-ratio': {
    title: 'Setting the instrument',
    say: (d) => {
      const invert = d.invert ? ` The scale is negative: switch on the channel's invert so that a positive ${d.measurand} reads positive.` : '';
      // A zero below a thousandth of a displayed unit needs no nulling.
      if (Math.abs(d.offsetShown) < 1e-3) return `Set the instrument's probe ratio to ${d.ratio}×: with the zero at 0 V it then reads ${d.measurand} directly.${invert}`;
      const coupling = d.ac ? ' For an AC reading, AC coupling removes it as well.' : '';
      return `With the probe ratio at ${d.ratio}× one displayed unit is one ${d.measurand}, but the zero of ${f3(d.offset, 'V')} shows as ${f3(d.offsetShown, d.measurand)} when nothing is measured. Null it before reading: set the channel's offset to ${f3(-d.offsetShown, d.measurand)} on screen (${f3(-d.offset, 'V')} at its input), or subtract a reference channel that sees the probe's zero (its output at zero ${d.measurand}, or a ${f3(d.offset, 'V')} source).${coupling}${invert}`;
    },
  },
  'no-50-ohm': { title: 'Not into 50 Ω', say: () => 'Do not switch the instrument to its 50 Ω input: the op-amp cannot drive it over the range.' },
  'capacitive-load': { title: 'Capacitive load on the op-amp output', say: (d) => `The instrument and cable capacitance sits on the op-amp output unisolated: fit a series resistor of about ${f3(d.isolation, 'Ω')} (the output series resistor).` },
  'no-zero-trim': { title: 'No zero trimmer', say: () => 'No zero trimmer could be fitted; the zero depends on part tolerances.' },
  'battery-clips': {
    title: 'Clips as the battery runs down',
    say: (d) => `Once the battery is down to ${f3(d.voltage, 'V')} the output clips inside the range; end of life is ${f3(d.endOfLife, 'V')}, where it is linear only from ${f3(d.low, d.measurand)} to ${f3(d.high, d.measurand)}.${d.hoursToClip !== null && d.hoursToEnd !== null ? ` A fresh battery gets there after about ${d.hoursToClip.toFixed(1)} h, of ${d.hoursToEnd.toFixed(1)} h to end of life (voltage taken as falling linearly with the charge drawn).` : ''}`,
  },
  'battery-scale-shift': { title: 'Scale moves as the regulator drops out', say: (d) => `Below ${f3(d.below, 'V')} the regulator drops out (${f3(d.dropout, 'V')} dropout) and the ratiometric sensor on it scales with its falling output: at ${f3(d.voltage, 'V')} the scale is ${f3(d.scale, `V/${d.measurand}`)}, ${(d.change * 100).toFixed(1)} % off.` },
  'battery-zero-shift': {
    title: 'Zero moves with the battery',
    say: (d) => {
      // Say the cause that applies: advice to regulate what is already regulated helps nobody.
      const cause = d.cause === 'reference-on-battery' ? 'because the reference is taken from it; feed the reference from a regulated rail'
        : d.cause === 'ratiometric-sensor' ? 'because the ratiometric sensor is fed from it and its zero follows its supply; feed the sensor from the regulated rail too'
        : d.cause === 'regulator-dropout' && d.regulated !== null && d.dropsOutBelow !== null ? `because the ${f3(d.regulated, 'V')} regulator loses regulation below about ${f3(d.dropsOutBelow, 'V')}; a lower regulated voltage keeps it in regulation to the end`
        : 'through what is still fed from the battery';
      return `The zero moves by up to ${f3(d.shift, 'V')} as the battery sags, ${cause}.`;
    },
  },
  'sensor-over-voltage': { title: 'Sensor fed above its rated supply', say: (d) => `The sensor is fed up to ${f3(d.high, 'V')} from ${SOURCE_FROM[d.from]}, above the ${f3(d.rated, 'V')} it is specified for: it may be damaged. Feed it from a regulated rail (Supply: regulated rail, sensor fed from it) or use a sensor specified for this supply.` },
  // --- issue 19: the range switch.
  'range-stage': { title: 'No range switch for this stage', say: (d) => `A range switch is designed for the non-inverting and inverting stages, whose gain one feedback arm sets; this design uses ${d.buffer ? 'a unity buffer, which has no feedback arm to switch' : d.topology ? `the ${stageName(d.topology)} stage` : 'no working stage'}. ${d.buffer ? 'Ask for a gain above 1 on the first range' : 'Choose the non-inverting or inverting stage'}, or design each range as its own probe.` },
  'range-wiring': {
    title: 'Range switch wiring',
    say: (d) => {
      const why = d.decidedBy === 'asked' ? 'as the design asks'
        : d.decidedBy === 'zero-holds' ? `because one pole moves the zero by at most ${f3(d.singlePoleShift, 'V')}, within the ${f3(d.limit, 'V')} allowed`
        : d.decidedBy === 'zero-moves' ? `because one pole would move the zero by up to ${f3(d.singlePoleShift, 'V')}, more than the ${f3(d.limit, 'V')} allowed`
        : 'because no reference within the rails holds the zero on every range, so each range keeps its own zero';
      const what = d.wiring === 'single-pole'
        ? `a single-pole ${d.throws}-way switch changes the feedback arm (and its span trimmer); the reference and the zero trimmer are shared, so the zero moves with the gain and each range is zeroed on its own`
        : `a two-pole ${d.throws}-way switch changes the feedback arm and the reference divider together, each position with its own span and zero trimmer, so the zero holds on every range${d.idleCurrent > 0 ? ` (the dividers not in use still draw ${f3(d.idleCurrent, 'A')} from their rail)` : ''}`;
      return `Range switch: ${what}; chosen ${why}. The other wiring can be asked for (Range switch wiring).`;
    },
  },
  'range-unbuilt': { title: 'A range cannot be built', say: (d) => `Range ${d.position} (${f3(d.scale, `V/${d.measurand}`)}) cannot be built on this stage: ${d.cause === 'zero-unreachable' ? 'the reference that would hold the zero lies beyond the rails; wire the switch with one pole (the zero then moves) or move the zero' : 'its gain is beyond what the stage can give with its shared parts (a non-inverting stage cannot attenuate); change the scale or the stage'}.` },
  'range-zero-shift': { title: 'Zero moves with the range', say: (d) => `On range ${d.position} (${f3(d.scale, `V/${d.measurand}`)}) the zero sits at ${f3(d.zero, 'V')}, ${f3(d.shift, 'V')} from the first range's: null it on the instrument (its offset) or read from it. The zero trimmer is set on the first range; it leaves up to ±${f3(d.residual, 'V')} of zero error here.` },
  // --- end issue 19
  // --- issue 18: notes on the supply choices.
  'supply-zero-centred': {
    title: 'A zero for the end of battery life',
    say: (d) => `A zero of ${f3(d.to, 'V')} instead of ${f3(d.from, 'V')} leaves equal headroom at both ends of the range once the battery is down to ${f3(d.endOfLife, 'V')}: linear there from ${f3(d.newLow, d.measurand)} to ${f3(d.newHigh, d.measurand)}, instead of ${f3(d.low, d.measurand)} to ${f3(d.high, d.measurand)}. Only the zero changes; the instrument then reads the new zero as nothing measured.`,
  },
  'supply-front-end-regulated': {
    title: 'The whole front end on a regulator',
    say: (d) => `The op-amp, the sensor and the reference all run from a ${f3(d.voltage, 'V')} regulator fed by the battery, so the rails hold while it sags. The battery is spent at ${f3(d.endOfLife, 'V')}: ${d.endOfLife > d.batteryEnd ? `the regulator's output plus its ${f3(d.dropout, 'V')} dropout, above the battery's own ${f3(d.batteryEnd, 'V')} end point` : `its own end point (the regulator holds down to ${f3(d.voltage + d.dropout, 'V')}, its output plus its dropout)`}. The battery life counts the regulator's own ${f3(d.quiescent, 'A')}.${d.zeroTo === null ? '' : ` The zero moves from ${f3(d.zeroFrom, 'V')} to ${f3(d.zeroTo, 'V')} to fit the regulated rail.`}`,
  },
  'supply-rail-to-rail': {
    title: 'A rail-to-rail output op-amp',
    say: (d) => `The best rail-to-rail output op-amp of the comparison, ${d.name}, swings to within ${f3(d.outputHigh, 'V')} of the positive rail and ${f3(d.outputLow, 'V')} of the negative one (an op-amp that is not rail-to-rail stops a volt or two short), on the battery as it is: ${d.low === null || d.high === null ? 'no linear range at end of battery life' : `linear from ${f3(d.low, d.measurand)} to ${f3(d.high, d.measurand)} at end of battery life`}.`,
  },
  // --- end issue 18
  'sensor-under-voltage': { title: 'Sensor fed below its rated supply', say: (d) => `The sensor is fed down to ${f3(d.low, 'V')} from ${SOURCE_FROM[d.from]}, below the ${f3(d.rated, 'V')} it is specified for: its output is not specified there.` },
};

/** A finding's sentence. */
export function sayFinding(f: Finding): string {
  return (FINDING_WORDS[f.code].say as (d: unknown) => string)(f.data);
}

/** A finding's title, as a verdict line heads it. */
export function findingTitle(code: FindingCode): string {
  return FINDING_WORDS[code].title;
}
