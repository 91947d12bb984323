/**
 * Everything a report says in words, derived once for a view: the verdict lines, the findings with their
 * titles and sentences, the calibration steps and the cautions for the sensor at hand.
 */
import type { Report } from '../analysis/report.js';
import type { FindingCode, FindingLevel } from '../model/findings.js';
import { calibrationSteps, type CalibrationStep } from './calibration.js';
import { cautionsFor } from './cautions.js';
import { findingTitle, sayFinding } from './finding-words.js';
import { verdictsOf, type Verdict } from './verdicts.js';

/** A finding as a person reads it. */
export interface WordedFinding {
  code: FindingCode;
  level: FindingLevel;
  title: string;
  message: string;
}

export interface ReportWords {
  verdicts: Verdict[];
  findings: WordedFinding[];
  calibration: CalibrationStep[];
  cautions: string[];
}

/** The report's words: `reportWords(analyse(design)).verdicts[0].title` is the worst verdict's title. */
export function reportWords(r: Report): ReportWords {
  return {
    verdicts: verdictsOf(r),
    findings: r.warnings.map((w) => ({ code: w.code, level: w.level, title: findingTitle(w.code), message: sayFinding(w) })),
    calibration: calibrationSteps(r),
    cautions: cautionsFor(r.design.sensor.type, r.front.cautions),
  };
}
