/** Coded, path-addressed findings (JSON Pointer paths into the view), the house form for every bad input. */
export interface Finding {
  code: string;
  path: string;
  message: string;
}

/** Thrown by `renderProof` for a view that does not validate; carries every finding, not just the first. */
export class ProofViewError extends Error {
  constructor(readonly findings: Finding[]) {
    super(
      `proof view is not valid (${findings.length} finding${findings.length === 1 ? '' : 's'}): ` +
        findings.slice(0, 5).map((f) => `${f.path} ${f.code}: ${f.message}`).join('; ') +
        (findings.length > 5 ? '; …' : ''),
    );
    this.name = 'ProofViewError';
  }
}
