/**
 * Coded domain errors. Services throw these; one global filter maps each kind to its HTTP status, so no
 * service knows about HTTP. A finding is path-addressed: which field, what was expected.
 */
export interface Finding {
  code: string;
  path: string;
  message: string;
}

export type ErrorKind =
  | 'invalid'
  | 'not_found'
  | 'conflict'
  | 'unavailable'
  | 'forbidden'
  | 'unauthenticated'
  /** Well-formed, but cannot be carried out as sent (e.g. an idempotency key reused for another request). */
  | 'unprocessable'
  /** Over a rate limit; `details.retryAfterSeconds` says when to try again. */
  | 'too_many_requests';

export class DomainException extends Error {
  constructor(
    readonly kind: ErrorKind,
    readonly code: string,
    message: string,
    readonly findings: Finding[] = [],
    readonly details: Record<string, unknown> = {},
  ) {
    super(message);
    this.name = 'DomainException';
  }
}

export class InvalidInputException extends DomainException {
  constructor(findings: Finding[], message = describeFindings(findings)) {
    super('invalid', 'invalid_input', message, findings);
  }
}

export class NotFoundException extends DomainException {
  /** `where`: the scope searched, e.g. "on this repair order"; by default the caller's shop. */
  constructor(what: string, id: string, where = 'in this shop') {
    super('not_found', `${what}.not_found`, `No ${what.replace(/_/g, ' ')} with id ${id} ${where}.`);
  }
}

export class ConflictException extends DomainException {
  constructor(code: string, message: string, details: Record<string, unknown> = {}, findings: Finding[] = []) {
    super('conflict', code, message, findings, details);
  }
}

export function describeFindings(findings: Finding[]): string {
  if (findings.length === 0) return 'The request is not valid.';
  const first = findings[0];
  const more = findings.length > 1 ? ` (and ${findings.length - 1} more)` : '';
  return `${first.path ? `${first.path}: ` : ''}${first.message}${more}`;
}

/** Prefixes every finding's path, e.g. to place an engine finding under `body.vehicle`. */
export function underPath(prefix: string, findings: Finding[]): Finding[] {
  return findings.map((f) => ({ ...f, path: f.path ? `${prefix}.${f.path}` : prefix }));
}

/** Over a request budget: answered 429 with `Retry-After`. */
export class TooManyRequestsException extends DomainException {
  constructor(code: string, message: string, retryAfterSeconds: number) {
    super('too_many_requests', code, message, [], { retryAfterSeconds });
  }
}
