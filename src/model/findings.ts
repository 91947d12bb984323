/** Findings the report carries, in plain words, each with a stable code for tools. */
export type WarningLevel = 'fail' | 'caution' | 'info';

export interface Warning {
  /** Stable identifier, e.g. `clips-in-range`. */
  code: string;
  level: WarningLevel;
  message: string;
}
