/**
 * A coded, path-addressed result: what is wrong (`code`, stable for programs), where (`path`, dotted, e.g.
 * `vehicle.vin` or `tests.3.outcomes.1`), and why in plain words. The engine returns findings; it never
 * throws strings at its callers.
 */
export interface Finding {
  code: string;
  path: string;
  message: string;
}

export type Checked<T> = ({ ok: true } & T) | { ok: false; findings: Finding[] };
