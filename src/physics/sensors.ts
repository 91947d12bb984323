/**
 * Sensor front models. Each model turns the parts a person holds (a Hall sensor in a gapped core, a
 * current transformer and its burden, a shunt, or any voltage-output sensor) into one common description,
 * `SensorFront`, that the rest of Gainwright consumes without knowing which model made it.
 */
import type { Design, SensorCommon, SensorSpec } from '../model/design.js';
import { MU0 } from '../model/constants.js';
import { finding, type Finding, type LimitData, type SensorCaution } from '../model/findings.js';
import { closedLoopFront } from './closed-loop-front.js';

export type SensorLimitKind = 'sensor' | 'core' | 'burden' | 'driver';

/** A measurand interval beyond which the sensor itself stops being linear. */
export interface SensorLimit {
  kind: SensorLimitKind;
  low: number;
  high: number;
  /** The numbers behind the limit, for its wording. */
  data: LimitData;
}

export interface SensorFigure {
  key: string;
  label: string;
  value: number;
  unit: string;
}

export interface SensorFront extends SensorCommon {
  /** Output volts per measurand unit at the sensor's nominal supply. */
  sensitivity: number;
  /** Output at zero measurand, V. */
  quiescent: number;
  outputMin: number;
  outputMax: number;
  /** Whether the source resistance is a real resistor whose thermal noise adds (burden, shunt). */
  sourceNoisy: boolean;
  /** Lower −3 dB frequency, Hz; 0 for a sensor that passes DC. */
  lowCorner: number;
  passesDc: boolean;
  /** Sensor supply at which sensitivity and quiescent were given, if they scale with it. */
  ratiometricSupply: number | null;
  /**
   * Null for a single-ended output (its − terminal is the amplifier's ground). For a differential output
   * (a bridge, a high-side shunt): the voltage of the fixed terminal, V; the signal is the difference
   * V(+) − V(−) = quiescent + sensitivity·x.
   */
  commonMode: number | null;
  /** Resistance in series with the − terminal, Ω (0 for a single-ended sensor); `sourceResistance` is the + terminal's. */
  minusResistance: number;
  limits: SensorLimit[];
  figures: SensorFigure[];
  warnings: Finding[];
  /** Cautions that belong to this kind of sensor (worded in src/present/cautions.ts). */
  cautions: SensorCaution[];
}

/**
 * Flux density in the air gap per ampere of measured current, T/A, for a core of relative permeability
 * μr and mean path l_e with a gap g and N turns, fringing neglected (Ampère's law around the magnetic
 * circuit; e.g. Umans, Fitzgerald & Kingsley's Electric Machinery, 7th ed., §1.1):
 *   B = μ0·N·I / (g + l_e/μr)
 * `gapFieldPerAmp(1, 1e-3, 0.05, 2000)` → 1.2260e-3 T/A (derived).
 */
export function gapFieldPerAmp(turns: number, gap: number, pathLength: number, permeability: number): number {
  return (MU0 * turns) / (gap + pathLength / permeability);
}

/**
 * Effective area of an air gap with fringing, relative to the core's cross-section, A_g/A_c. With the
 * cross-section's two dimensions a × b given, fringing is accounted for by adding the gap length to each of
 * them, A_g = (a + g)·(b + g) (Umans, Fitzgerald & Kingsley's Electric Machinery, 7th ed., ch. 1, the
 * approximation used in its problems; from memory); without them the user's fringing factor F = A_g/A_c is
 * taken as given (McLyman's fringing factor, Transformer and Inductor Design Handbook; 1 = no fringing).
 * `gapAreaRatio({ gap: 1e-3, width: 0.01, depth: 0.01, fringing: 1 })` → 1.21 (derived).
 */
export function gapAreaRatio(core: { gap: number; width?: number; depth?: number; fringing: number }): number {
  // One dimension alone is taken as a square section.
  const a = core.width ?? core.depth, b = core.depth ?? core.width;
  if (a && b) return ((a + core.gap) * (b + core.gap)) / (a * b);
  return core.fringing;
}

/**
 * Flux densities per ampere in a gapped core whose gap has an effective area F·A_c (F = A_g/A_c). The
 * magnetic circuit is two reluctances in series, R_c = l_e/(μ0·μr·A_c) and R_g = g/(μ0·F·A_c), driven by
 * N·I (Umans, Fitzgerald & Kingsley's Electric Machinery, 7th ed., §1.1, eqs. 1.10–1.13), so
 *   Φ/I = μ0·N·A_c / (l_e/μr + g/F),   B_core = Φ/A_c,   B_gap = Φ/(F·A_c) = μ0·N / (g + F·l_e/μr).
 * The Hall sensor is taken to see the gap's mean flux density B_gap (our stated assumption); the core
 * saturates on B_core = F·B_gap. F = 1 gives `gapFieldPerAmp` for both.
 * `gappedCorePerAmp(1, 1e-3, 0.06, 2000, 1.21)` → gap 1.2102e-3 T/A, core 1.4644e-3 T/A (derived).
 */
export function gappedCorePerAmp(turns: number, gap: number, pathLength: number, permeability: number, areaRatio: number): { gap: number; core: number } {
  const g = (MU0 * turns) / (gap + (areaRatio * pathLength) / permeability);
  return { gap: g, core: g * areaRatio };
}

/** The voltage of the rail that feeds the sensor, V. */
export function sensorRailVoltage(design: Pick<Design, 'supply'>): number {
  return design.supply.sensorRail === 'regulated' && design.supply.regulated ? design.supply.regulated.voltage : design.supply.positive;
}

/** The front at the rail that actually feeds the sensor (a ratiometric sensor scales with it). */
export function sensorFrontAtRail(spec: SensorSpec, design: Pick<Design, 'target' | 'supply'>): SensorFront {
  return atSensorSupply(sensorFront(spec, design), sensorRailVoltage(design));
}

/** Turns a sensor spec and the rail that feeds it into the common front description. */
export function sensorFront(spec: SensorSpec, design: Pick<Design, 'target' | 'supply'>): SensorFront {
  const range = design.target.range;
  const peak = design.target.signal === 'ac-rms' ? Math.SQRT2 : 1;
  const sensorRail = sensorRailVoltage(design);
  const base = {
    measurand: spec.measurand,
    sourceResistance: spec.sourceResistance,
    noiseDensity: spec.noiseDensity,
    bandwidth: spec.bandwidth,
    sensitivityTolerance: spec.sensitivityTolerance,
    quiescentTolerance: spec.quiescentTolerance,
    sensitivityDrift: spec.sensitivityDrift,
    quiescentDrift: spec.quiescentDrift,
    supplyCurrent: spec.supplyCurrent,
    outputDrive: spec.outputDrive,
    sourceNoisy: false,
    lowCorner: 0,
    passesDc: true,
    commonMode: null as number | null,
    minusResistance: 0,
    limits: [] as SensorLimit[],
    figures: [] as SensorFigure[],
    warnings: [] as Finding[],
    cautions: [] as SensorCaution[],
  };
  switch (spec.type) {
    case 'voltage-output': {
      return {
        ...base,
        sensitivity: spec.sensitivity,
        quiescent: spec.quiescent,
        outputMin: spec.outputMin ?? design.supply.negative,
        outputMax: spec.outputMax ?? sensorRail,
        ratiometricSupply: spec.ratiometricSupply ?? null,
        commonMode: spec.commonMode ?? null,
        // A differential output's resistance is shared by its two terminals (a bridge's two arms).
        ...(spec.commonMode !== null && spec.commonMode !== undefined ? { sourceResistance: spec.sourceResistance / 2, minusResistance: spec.sourceResistance / 2 } : {}),
      };
    }
    case 'hall-gap-core': {
      const { pathLength, permeability, gap, saturation } = spec.core;
      const areaRatio = gapAreaRatio(spec.core);
      const perAmp = (g: number) => gappedCorePerAmp(spec.turns, g, pathLength, permeability, gapAreaRatio({ ...spec.core, gap: g }));
      const { gap: bPerAmp, core: coreBPerAmp } = perAmp(gap);
      const sensitivity = spec.hallSensitivity * bPerAmp;
      const coreLimit = saturation / coreBPerAmp;
      const linLimit = spec.linearField / bPerAmp;
      const dGap = perAmp(gap + 1e-4).gap / bPerAmp - 1;
      const earth = 50e-6 / bPerAmp; // about 50 µT (common practice)
      const front: SensorFront = {
        ...base,
        sensitivity,
        quiescent: spec.quiescent,
        outputMin: spec.outputMin ?? design.supply.negative,
        outputMax: spec.outputMax ?? sensorRail,
        ratiometricSupply: spec.ratiometricSupply ?? null,
        limits: [
          { kind: 'core', low: -coreLimit, high: coreLimit, data: { cause: 'core', saturation } },
          { kind: 'sensor', low: -linLimit, high: linLimit, data: { cause: 'sensor', what: 'hall-linear', field: spec.linearField } },
        ],
        figures: [
          { key: 'fieldPerAmp', label: 'Gap field per ampere (mean over the gap\'s effective area)', value: bPerAmp, unit: 'T/A' },
          { key: 'coreFieldPerAmp', label: 'Core flux density per ampere', value: coreBPerAmp, unit: 'T/A' },
          { key: 'gapAreaExcess', label: 'Gap effective area beyond the core cross-section (fringing, A_g/A_c − 1)', value: areaRatio - 1, unit: '' },
          { key: 'sensitivity', label: 'Sensitivity', value: sensitivity, unit: `V/${spec.measurand}` },
          { key: 'coreSaturation', label: 'Core saturates at', value: coreLimit, unit: spec.measurand },
          { key: 'hallLinear', label: 'Hall sensor leaves its linear range at', value: linLimit, unit: spec.measurand },
          { key: 'gapSensitivity', label: 'Sensitivity change per +0.1 mm of gap', value: dGap, unit: '' },
          { key: 'earthField', label: "Earth's field (about 50 µT) reads as", value: earth, unit: spec.measurand },
        ],
        warnings: [
          spec.core.width || spec.core.depth
            ? finding('fringing-model', 'info', { areaRatio, from: spec.core.width && spec.core.depth ? 'section' : 'square-section' })
            : areaRatio === 1
              ? finding('fringing-neglected', 'info', {})
              : finding('fringing-model', 'info', { areaRatio, from: 'factor' }),
          finding('remanence', 'info', {}),
          finding('earth-field', 'info', { reading: earth, measurand: spec.measurand }),
        ],
      };
      if (Math.abs(dGap) > 0.05) {
        front.warnings.push(finding('gap-critical', 'caution', { changePerTenthMm: dGap }));
      }
      return front;
    }
    case 'current-transformer': {
      const lm = spec.inductanceFactor * spec.secondaryTurns ** 2;
      const sensitivity = (spec.primaryTurns * spec.burden) / spec.secondaryTurns;
      const corner = (spec.burden + spec.windingResistance) / (2 * Math.PI * lm);
      // Burden power at the largest rms current of the range: (I·Np/Ns)²·R_b.
      const iMax = Math.max(Math.abs(range[0]), Math.abs(range[1]));
      const irms = design.target.signal === 'ac-rms' ? iMax : iMax / Math.SQRT2;
      const pBurden = ((irms * spec.primaryTurns) / spec.secondaryTurns) ** 2 * spec.burden;
      const iBurden = Math.sqrt(spec.burdenPower / spec.burden) * spec.secondaryTurns / spec.primaryTurns; // rms
      const front: SensorFront = {
        ...base,
        sensitivity,
        quiescent: spec.quiescent,
        outputMin: -Infinity,
        outputMax: Infinity,
        sourceResistance: spec.burden,
        sourceNoisy: true,
        lowCorner: corner,
        passesDc: false,
        ratiometricSupply: null,
        limits: [{ kind: 'burden', low: -iBurden * Math.SQRT2, high: iBurden * Math.SQRT2, data: { cause: 'burden', part: 'burden', power: spec.burdenPower } }],
        figures: [
          { key: 'sensitivity', label: 'Sensitivity', value: sensitivity, unit: `V/${spec.measurand}` },
          { key: 'magnetisingInductance', label: 'Magnetising inductance', value: lm, unit: 'H' },
          { key: 'lowCorner', label: 'Low-frequency corner', value: corner, unit: 'Hz' },
          { key: 'burdenPower', label: 'Burden power at the top of the range', value: pBurden, unit: 'W' },
        ],
        cautions: ['ct-open-secondary'],
      };
      if (pBurden > spec.burdenPower) {
        front.warnings.push(finding('burden-power', 'fail', { power: pBurden, rating: spec.burdenPower }));
      }
      if (design.target.signal === 'dc') {
        front.warnings.push(finding('ct-no-dc', 'fail', {}));
      }
      return front;
    }
    case 'closed-loop-hall':
      return closedLoopFront(spec, design, base);
    case 'shunt': {
      // Joule heating follows the rms current: P = I_rms²·R. A DC range end is its own rms; an AC range is
      // given in rms already. The rated current √(P/R) is therefore an rms figure too, and its clip limit
      // (the range is checked in peaks) is √2 × that for an AC signal.
      const iEnd = Math.max(Math.abs(range[0]), Math.abs(range[1]));
      const iMax = iEnd * peak;
      const p = iEnd ** 2 * spec.resistance;
      const iRated = Math.sqrt(spec.powerRating / spec.resistance) * peak;
      const front: SensorFront = {
        ...base,
        sensitivity: spec.resistance,
        quiescent: 0,
        outputMin: -Infinity,
        outputMax: Infinity,
        sourceResistance: spec.resistance + spec.sourceResistance,
        sourceNoisy: true,
        ratiometricSupply: null,
        limits: [{ kind: 'burden', low: -iRated, high: iRated, data: { cause: 'burden', part: 'shunt', power: spec.powerRating } }],
        figures: [
          { key: 'sensitivity', label: 'Sensitivity', value: spec.resistance, unit: `V/${spec.measurand}` },
          { key: 'burdenVoltage', label: `Burden voltage added to the measured circuit at the range end${peak > 1 ? ' (peak)' : ''}`, value: iMax * spec.resistance, unit: 'V' },
          { key: 'shuntPower', label: 'Shunt power at the range end (I²rms·R)', value: p, unit: 'W' },
        ],
        commonMode: spec.commonMode ?? null,
        // High side: the + terminal is the supply end itself, the − terminal sits behind the shunt.
        ...(spec.commonMode !== null && spec.commonMode !== undefined ? { sourceResistance: spec.sourceResistance, minusResistance: spec.resistance } : {}),
        warnings: spec.commonMode === null || spec.commonMode === undefined
          ? [finding('low-side-only', 'info', {})]
          : [],
      };
      if (p > spec.powerRating) {
        front.warnings.push(finding('shunt-power', 'fail', { power: p, rating: spec.powerRating }));
      }
      return front;
    }
  }
}

/** The front as seen at another sensor supply, for a ratiometric sensor (quiescent and gain scale). */
export function atSensorSupply(front: SensorFront, sensorSupply: number): SensorFront {
  if (!front.ratiometricSupply) return front;
  const k = sensorSupply / front.ratiometricSupply;
  // The result is stated at its new supply, so scaling it again stays relative to that.
  return { ...front, sensitivity: front.sensitivity * k, quiescent: front.quiescent * k, outputMax: Math.min(front.outputMax, sensorSupply), ratiometricSupply: sensorSupply };
}
