/**
 * Choosing the next test by expected cost (the notes' stop / Q1 / Q2 / V):
 *
 *   stop(e)  = cost of concluding now        Q_k(e,t) = C_t(e) + Σ_o P(o|e) · W_{k−1}(e ∪ {t=o})
 *   W_0(e)   = stop(e)                        W_k(e)   = min(stop(e), min_t Q_k(e,t))
 *
 * Q1 is myopic, Q2 looks two steps ahead, W_∞ is the exact value V (dynamic programming over test outcomes,
 * memoised on the evidence state, with branch-and-bound). C_t(e) includes set-up steps not yet paid for: a
 * connector unplugged once serves every later test that needs it unplugged.
 */

import type { PlanningBudget } from './planning-budget';

export interface PolicyTest {
  cost: number;
  /** Bit i set when the test needs set-up i. */
  setupMask: number;
  nO: number;
  /** P(o | h) at index h * nO + o. */
  like: ArrayLike<number>;
}

export interface PolicyModel {
  nH: number;
  tests: PolicyTest[];
  setupCosts: number[];
  /** Cost of stopping when the leading cause has probability `maxP` (e.g. L · (1 − maxP), or 0 at the threshold). */
  stopCost(maxP: number): number;
  /** True when no more testing is considered (the leading cause reached the threshold). */
  isTerminal(maxP: number): boolean;
  /** Time allowed for planning; once spent, searches give their cheap answer (see planning-budget.ts). */
  budget?: PlanningBudget;
}

export interface PolicyState {
  /** Normalised posterior over hypotheses. */
  p: Float64Array;
  /** Per test: −2 closed (not to be proposed), −1 open, ≥ 0 the outcome observed. */
  done: Int16Array;
  /** Bit mask of set-ups already paid for. */
  paid: number;
}

export interface Branch {
  po: Float64Array;
  posts: Float64Array[];
}

export function testCost(model: PolicyModel, state: PolicyState, t: number): number {
  return costWith(model, state.paid, t);
}

/** Outcome probabilities P(o | e) and the posterior after each outcome. */
export function branch(model: PolicyModel, p: Float64Array, t: number): Branch {
  const { nO, like } = model.tests[t]!;
  const po = new Float64Array(nO);
  const posts: Float64Array[] = [];
  for (let o = 0; o < nO; o++) {
    const post = new Float64Array(model.nH);
    let z = 0;
    for (let h = 0; h < model.nH; h++) z += post[h] = p[h]! * like[h * nO + o]!;
    po[o] = z;
    if (z > 0) for (let h = 0; h < model.nH; h++) post[h] = post[h]! / z;
    posts.push(post);
  }
  return { po, posts };
}

export function child(state: PolicyState, model: PolicyModel, t: number, o: number, post: Float64Array): PolicyState {
  const done = state.done.slice();
  done[t] = o;
  return { p: post, done, paid: state.paid | model.tests[t]!.setupMask };
}

export const openTests = (state: PolicyState): number[] => Array.from(state.done.keys()).filter((t) => state.done[t] === -1);

/** Q_depth(e, t): cost of test t, then the best depth−1 policy (depth 1 = myopic Q1, 2 = Q2). */
export function lookaheadQ(model: PolicyModel, state: PolicyState, t: number, depth: number): number {
  if (depth === 1) return q1(model, state.p, t, state.paid);
  if (depth === 2) return q2(model, state, t);
  const { po, posts } = branch(model, state.p, t);
  let q = testCost(model, state, t);
  for (let o = 0; o < po.length; o++) if (po[o]! > 0) q += po[o]! * lookaheadW(model, child(state, model, t, o, posts[o]!), depth - 1);
  return q;
}

/** W_depth(e) = min(stop(e), min_t Q_depth(e, t)); W_0 = stop. */
export function lookaheadW(model: PolicyModel, state: PolicyState, depth: number): number {
  const max = maxOf(state.p);
  const stop = model.stopCost(max);
  if (depth <= 0 || model.isTerminal(max)) return stop;
  let best = stop;
  for (const t of openTests(state)) best = Math.min(best, lookaheadQ(model, state, t, depth));
  return best;
}

/** Memo for exact values, keyed on the evidence state (which tests were done with which outcome). */
export interface ExactMemo {
  values: Map<number | string, number>;
  /** States evaluated (a work counter for budgets and benchmarks). */
  expanded: number;
  /**
   * 0 = exact. Above 0, branches reached with probability below this are valued by one-step lookahead instead
   * (a near-optimal policy for trees too large to solve exactly; the error is at most that mass × the stop cost).
   */
  minPathProbability: number;
  /** Probability mass valued by lookahead instead of exactly (summed over pruned branches). */
  prunedMass: number;
}

export const newExactMemo = (minPathProbability = 0): ExactMemo => ({ values: new Map(), expanded: 0, minPathProbability, prunedMass: 0 });

function stateKey(state: PolicyState, model: PolicyModel): number | string {
  let key = 0;
  let radix = 1;
  for (let t = 0; t < state.done.length; t++) {
    key += (state.done[t]! + 2) * radix;
    radix *= model.tests[t]!.nO + 2;
  }
  return radix <= Number.MAX_SAFE_INTEGER ? key : state.done.join(',');
}

/** Exact V(e) by memoised branch-and-bound (see ExactMemo for the pruned, near-optimal variant). */
export function exactV(model: PolicyModel, state: PolicyState, memo: ExactMemo = newExactMemo(), pathProbability = 1): number {
  const max = maxOf(state.p);
  const stop = model.stopCost(max);
  if (model.isTerminal(max)) return stop;
  const key = stateKey(state, model);
  const known = memo.values.get(key);
  if (known !== undefined) return known;
  if (pathProbability < memo.minPathProbability) {
    memo.prunedMass += pathProbability;
    return lookaheadW(model, state, 1);
  }
  memo.expanded++;
  let best = stop;
  for (const { t, c, b } of orderedCandidates(model, state)) {
    if (c >= best) continue;
    let q = c;
    for (let o = 0; o < b.po.length && q < best; o++)
      if (b.po[o]! > 1e-12) q += b.po[o]! * exactV(model, child(state, model, t, o, b.posts[o]!), memo, pathProbability * b.po[o]!);
    if (q < best) best = q;
  }
  memo.values.set(key, best);
  return best;
}

/** Exact Q(e, t) = C_t + Σ_o P(o|e) · V(e ∪ {t=o}). */
export function exactQ(model: PolicyModel, state: PolicyState, t: number, memo: ExactMemo = newExactMemo()): number {
  const { po, posts } = branch(model, state.p, t);
  let q = testCost(model, state, t);
  for (let o = 0; o < po.length; o++) if (po[o]! > 1e-12) q += po[o]! * exactV(model, child(state, model, t, o, posts[o]!), memo, po[o]!);
  return q;
}

/** Open tests ordered by their myopic value, so branch-and-bound finds a good bound early. */
function orderedCandidates(model: PolicyModel, state: PolicyState) {
  return openTests(state)
    .map((t) => {
      const b = branch(model, state.p, t);
      const c = testCost(model, state, t);
      let q1 = c;
      for (let o = 0; o < b.po.length; o++) q1 += b.po[o]! * model.stopCost(maxOf(b.posts[o]!));
      return { t, c, b, q1 };
    })
    .sort((x, y) => x.q1 - y.q1);
}

/** Upper bound on the number of evidence states below `state` (Π over open tests of outcomes + 1). */
export function stateSpaceSize(model: PolicyModel, state: PolicyState): number {
  return openTests(state).reduce((n, t) => n * (model.tests[t]!.nO + 1), 1);
}

/** True when some outcome of one or two more open tests would change the leading cause or settle it. */
export function canChangeConclusion(model: PolicyModel, state: PolicyState, depth = 2): boolean {
  const leader = argmax(state.p);
  for (const t of openTests(state)) {
    // Out of time: assume it can, so testing goes on rather than concluding on an unfinished search.
    if (model.budget?.exceeded()) return true;
    const { po, posts } = branch(model, state.p, t);
    for (let o = 0; o < po.length; o++) {
      if (po[o]! <= 1e-12) continue;
      if (argmax(posts[o]!) !== leader || model.isTerminal(maxOf(posts[o]!))) return true;
      if (depth > 1 && canChangeConclusion(model, child(state, model, t, o, posts[o]!), depth - 1)) return true;
    }
  }
  return false;
}

export function maxOf(p: ArrayLike<number>): number {
  let m = -Infinity;
  for (let i = 0; i < p.length; i++) if (p[i]! > m) m = p[i]!;
  return m;
}

/** Cost of test t given the set-ups in `paid`. */
function costWith(model: PolicyModel, paid: number, t: number): number {
  const test = model.tests[t]!;
  let cost = test.cost;
  const unpaid = test.setupMask & ~paid;
  for (let i = 0; unpaid >> i; i++) if ((unpaid >> i) & 1) cost += model.setupCosts[i]!;
  return cost;
}

/** Q1(e, t) without allocating: the stop cost after each outcome needs only the outcome's largest joint term. */
function q1(model: PolicyModel, p: ArrayLike<number>, t: number, paid: number): number {
  const { nO, like } = model.tests[t]!;
  let q = costWith(model, paid, t);
  for (let o = 0; o < nO; o++) {
    let z = 0;
    let m = 0;
    for (let h = 0; h < model.nH; h++) {
      const v = p[h]! * like[h * nO + o]!;
      z += v;
      if (v > m) m = v;
    }
    if (z > 0) q += z * model.stopCost(m / z);
  }
  return q;
}

let scratch = new Float64Array(0);

/** Q2(e, t) = C_t + Σ_o P(o|e) · min(stop(e'), min_u Q1(e', u)), reusing one posterior buffer. */
function q2(model: PolicyModel, state: PolicyState, t: number): number {
  const { nO, like } = model.tests[t]!;
  const nH = model.nH;
  if (scratch.length < nH) scratch = new Float64Array(nH);
  const post = scratch;
  const paid = state.paid | model.tests[t]!.setupMask;
  let q = costWith(model, state.paid, t);
  for (let o = 0; o < nO; o++) {
    let z = 0;
    for (let h = 0; h < nH; h++) z += post[h] = state.p[h]! * like[h * nO + o]!;
    if (z <= 0) continue;
    let m = 0;
    for (let h = 0; h < nH; h++) if ((post[h] = post[h]! / z) > m) m = post[h]!;
    let w = model.stopCost(m);
    if (!model.isTerminal(m)) {
      for (let u = 0; u < state.done.length; u++) {
        if (u === t || state.done[u] !== -1) continue;
        const qu = q1(model, post, u, paid);
        if (qu < w) w = qu;
      }
    }
    q += z * w;
  }
  return q;
}

export function argmax(p: ArrayLike<number>): number {
  let best = 0;
  for (let i = 1; i < p.length; i++) if (p[i]! > p[best]!) best = i;
  return best;
}

/** Shannon entropy in bits. */
export function entropyBits(p: ArrayLike<number>): number {
  let h = 0;
  for (let i = 0; i < p.length; i++) if (p[i]! > 0) h -= p[i]! * Math.log2(p[i]!);
  return h;
}

/** Expected entropy after test t, Σ_o P(o|e) · H(h | e, o) (de Kleer & Williams 1987). */
export function expectedEntropyAfter(model: PolicyModel, p: Float64Array, t: number): number {
  const { po, posts } = branch(model, p, t);
  let h = 0;
  for (let o = 0; o < po.length; o++) if (po[o]! > 0) h += po[o]! * entropyBits(posts[o]!);
  return h;
}
