/** Coded, path-addressed findings: how the diagnosis engine reports bad input and notable states. */

export type Severity = 'error' | 'warning' | 'info';

export interface Finding {
  /** Stable machine code, e.g. `tree.outcomes_overlap` or `reading.value_not_number`. */
  code: string;
  /** JSON path into the input, e.g. `tests[3].outcomes[1].condition`. */
  path: string;
  message: string;
  severity: Severity;
}

export function finding(code: string, path: string, message: string, severity: Severity = 'error'): Finding {
  return { code, path, message, severity };
}

export function hasErrors(findings: readonly Finding[]): boolean {
  return findings.some((f) => f.severity === 'error');
}

/** Joins path segments the way JSON paths are written: `tests[2].request.at`. */
export function joinPath(...segments: Array<string | number>): string {
  return segments.reduce<string>((path, segment) => {
    if (typeof segment === 'number') return `${path}[${segment}]`;
    return path === '' ? segment : `${path}.${segment}`;
  }, '');
}
