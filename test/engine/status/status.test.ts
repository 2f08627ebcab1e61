import { describe, expect, it } from 'vitest';
import { allowedMoves, checkMove, INITIAL_STATUS, MOVES, type Status, STATUSES } from '../../../src/engine/status';

// The status rules are the product's own workflow (documented in src/engine/status.ts), not an outside standard.
describe('allowedMoves', () => {
  it.each<[Status, Status[]]>([
    ['open', ['diagnosing']],
    ['diagnosing', ['repaired']],
    ['repaired', ['verified', 'diagnosing']],
    ['verified', ['closed', 'diagnosing']],
    ['closed', ['diagnosing']],
  ])('lets a %s repair order move to %j', (from, targets) => {
    expect(allowedMoves(from).map((m) => m.to)).toEqual(targets);
  });

  it('starts new repair orders as open', () => {
    expect(INITIAL_STATUS).toBe('open');
  });

  it('reaches every status from open by forward moves alone', () => {
    const reached: Status[] = [INITIAL_STATUS];
    let current: Status = INITIAL_STATUS;
    for (;;) {
      const next = allowedMoves(current).find((m) => m.kind === 'forward');
      if (!next) break;
      current = next.to;
      reached.push(current);
    }
    expect(reached).toEqual([...STATUSES]);
  });
});

describe('checkMove', () => {
  it.each<[Status, Status]>([
    ['open', 'diagnosing'],
    ['diagnosing', 'repaired'],
    ['repaired', 'verified'],
    ['verified', 'closed'],
  ])('allows the forward move %s → %s without a reason', (from, to) => {
    expect(checkMove(from, to)).toMatchObject({ ok: true, move: { from, to, kind: 'forward' }, reason: '' });
  });

  it.each<[Status]>([['repaired'], ['verified'], ['closed']])('reopens a %s repair order for diagnosis with a reason', (from) => {
    expect(checkMove(from, 'diagnosing', '  comeback: P0122 returned on the road test ')).toMatchObject({
      ok: true,
      move: { from, to: 'diagnosing', kind: 'reopen' },
      reason: 'comeback: P0122 returned on the road test',
    });
  });

  it.each<[Status, string | undefined]>([
    ['repaired', undefined],
    ['verified', ''],
    ['closed', '   '],
  ])('refuses to reopen a %s repair order with the reason %j', (from, reason) => {
    expect(checkMove(from, 'diagnosing', reason)).toMatchObject({
      ok: false,
      finding: { code: 'status.reason_required', path: 'reason' },
    });
  });

  it.each<[Status, Status, Status[], string]>([
    ['open', 'closed', ['diagnosing'], 'cannot move from open to closed'],
    ['diagnosing', 'verified', ['repaired'], 'cannot move from diagnosing to verified'],
    ['repaired', 'closed', ['verified', 'diagnosing'], 'cannot move from repaired to closed'],
    ['closed', 'open', ['diagnosing'], 'cannot move from closed to open'],
    ['diagnosing', 'open', ['repaired'], 'cannot move from diagnosing to open'],
    ['verified', 'verified', ['closed', 'diagnosing'], 'already verified'],
  ])('refuses %s → %s and lists %j as the allowed moves', (from, to, allowed, message) => {
    const result = checkMove(from, to, 'a reason does not make an illegal move legal');
    expect(result).toMatchObject({ ok: false, finding: { code: 'status.illegal_move', path: 'status', allowed } });
    expect(!result.ok && result.finding.message).toContain(message);
  });

  it.each([
    ['opened', 'diagnosing', 'from'],
    ['open', 'done', 'status'],
  ])('refuses the unknown status in %s → %s at path %s', (from, to, path) => {
    expect(checkMove(from as Status, to as Status)).toMatchObject({ ok: false, finding: { code: 'status.unknown', path } });
  });

  it('refuses a reason that is not text', () => {
    expect(checkMove('closed', 'diagnosing', 42 as unknown as string)).toMatchObject({
      ok: false,
      finding: { code: 'status.reason_not_text', path: 'reason' },
    });
  });

  it('requires a reason on every reopen move in the table and on no forward move', () => {
    expect(MOVES.every((m) => m.reasonRequired === (m.kind === 'reopen'))).toBe(true);
    expect(MOVES.filter((m) => m.kind === 'reopen').map((m) => m.to)).toEqual(['diagnosing', 'diagnosing', 'diagnosing']);
  });
});
