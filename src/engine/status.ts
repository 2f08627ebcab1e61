import type { Finding } from './findings';
/**
 * Repair-order status machine, as data. Work moves forward one step at a time:
 *   open → diagnosing → repaired → verified → closed
 * and can be reopened back to "diagnosing" from repaired, verified or closed, always with a reason (the
 * verification failed, the complaint came back, the foreman sent it back). Reopening from "open" or
 * "diagnosing" makes no sense (diagnosis has not ended), so it is not offered. Skipping steps is refused: a repair
 * is not closed before it is verified, because the proof of repair depends on the verification readings.
 */


export const STATUSES = ['open', 'diagnosing', 'repaired', 'verified', 'closed'] as const;
export type Status = (typeof STATUSES)[number];

export type MoveKind = 'forward' | 'reopen';

export interface Move {
  from: Status;
  to: Status;
  kind: MoveKind;
  reasonRequired: boolean;
}

export const MOVES: readonly Move[] = [
  { from: 'open', to: 'diagnosing', kind: 'forward', reasonRequired: false },
  { from: 'diagnosing', to: 'repaired', kind: 'forward', reasonRequired: false },
  { from: 'repaired', to: 'verified', kind: 'forward', reasonRequired: false },
  { from: 'verified', to: 'closed', kind: 'forward', reasonRequired: false },
  { from: 'repaired', to: 'diagnosing', kind: 'reopen', reasonRequired: true },
  { from: 'verified', to: 'diagnosing', kind: 'reopen', reasonRequired: true },
  { from: 'closed', to: 'diagnosing', kind: 'reopen', reasonRequired: true },
];

/** Status of a newly created repair order. */
export const INITIAL_STATUS: Status = 'open';

export function isStatus(value: unknown): value is Status {
  return typeof value === 'string' && (STATUSES as readonly string[]).includes(value);
}

/** The moves available from a status, in the order listed in MOVES (forward first). */
export function allowedMoves(from: Status): Move[] {
  return MOVES.filter((m) => m.from === from);
}

export interface StatusFinding extends Finding {
  /** For `status.illegal_move`: the statuses reachable from the current one. */
  allowed?: Status[];
}

export type CheckMoveResult = { ok: true; move: Move; reason: string } | { ok: false; finding: StatusFinding };

/**
 * Whether a repair order may move from `from` to `to`; on refusal, the one finding that explains it. The reason is
 * trimmed; a reopen needs a non-blank one. A reason given with a forward move is kept (it can be a note) but not
 * required.
 */
export function checkMove(from: Status, to: Status, reason?: string): CheckMoveResult {
  if (!isStatus(from)) {
    return { ok: false, finding: { code: 'status.unknown', path: 'from', message: `current status ${JSON.stringify(from)} is not one of ${STATUSES.join(', ')}` } };
  }
  if (!isStatus(to)) {
    return { ok: false, finding: { code: 'status.unknown', path: 'status', message: `status ${JSON.stringify(to)} is not one of ${STATUSES.join(', ')}` } };
  }

  const move = MOVES.find((m) => m.from === from && m.to === to);
  if (!move) {
    const allowed = allowedMoves(from).map((m) => m.to);
    const why = from === to ? `the repair order is already ${from}` : `a repair order cannot move from ${from} to ${to}`;
    return {
      ok: false,
      finding: {
        code: 'status.illegal_move',
        path: 'status',
        message: `${why}; from ${from} it can move to ${allowed.join(' or ')}`,
        allowed,
      },
    };
  }
  if (reason !== undefined && reason !== null && typeof reason !== 'string') {
    return { ok: false, finding: { code: 'status.reason_not_text', path: 'reason', message: 'reason must be text' } };
  }
  const trimmed = (reason ?? '').trim();
  if (move.reasonRequired && trimmed === '') {
    return {
      ok: false,
      finding: {
        code: 'status.reason_required',
        path: 'reason',
        message: `reopening a ${from} repair order for diagnosis needs a reason (e.g. what the verification showed or what came back)`,
      },
    };
  }
  return { ok: true, move, reason: trimmed };
}

export type { Finding };
