/**
 * One shape for every soft problem and notable fact a stage records (vfile-style messages).
 * Stages return them with their products; the report and summary.json only read them.
 */

export type Severity = 'info' | 'warning' | 'error';

export interface Diagnostic {
  severity: Severity;
  /** Stable rule id, `stage.rule` in kebab case, e.g. `arc.high-rms`, `lines.at-bound`. */
  rule: string;
  /** Stage that recorded it: `ccd`, `arc`, `sky`, `lines`, `velocity`, `geometry`, `run`, ... */
  stage: string;
  message: string;
  /** Where: file, row (0-based internal), wavelength (Angstrom), line name... */
  place?: { file?: string; row?: number; rowEnd?: number; wavelength?: number; line?: string; hdu?: number };
  expected?: string | number;
  actual?: string | number;
}

/** A collector a stage fills and returns; keeps the stage name so calls stay short. */
export class DiagnosticLog {
  readonly items: Diagnostic[] = [];
  constructor(readonly stage: string) {}

  info(rule: string, message: string, extra: Partial<Omit<Diagnostic, 'severity' | 'rule' | 'stage' | 'message'>> = {}): void {
    this.items.push({ severity: 'info', rule: `${this.stage}.${rule}`, stage: this.stage, message, ...extra });
  }
  warn(rule: string, message: string, extra: Partial<Omit<Diagnostic, 'severity' | 'rule' | 'stage' | 'message'>> = {}): void {
    this.items.push({ severity: 'warning', rule: `${this.stage}.${rule}`, stage: this.stage, message, ...extra });
  }
  error(rule: string, message: string, extra: Partial<Omit<Diagnostic, 'severity' | 'rule' | 'stage' | 'message'>> = {}): void {
    this.items.push({ severity: 'error', rule: `${this.stage}.${rule}`, stage: this.stage, message, ...extra });
  }
}
