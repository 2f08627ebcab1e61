/**
 * A back-probe that misses the terminal (the pin slid along the seal, or sits on corrosion) reads exactly like an
 * open circuit. So an open is not concluded on back-probed readings alone: at least one reading that argues for it
 * must come from a test whose leads do not depend on a back-probe (a scan value, an unplugged terminal, an ohms
 * check), or the back-probed reading must have been repeated. Until then the cheapest informative confirming test
 * is proposed; with none left, the back-probed reading is taken again. Common practice, no source.
 */
import { faultsFor } from '../circuit';
import { finding } from './findings';
import { argmax, openTests, type PolicyModel } from './policy';
import { cheapestTest, proposeTest, readingArguesFor } from './propose-test';
import { readingFactors } from './posterior';
import type { Decision, RuleContext } from './status-rules';
import type { Test } from './tree-model';

/** A reading argues for the leading cause when it is this many times likelier under it than under the rest. */
const ARGUES_FOR = 1.5;
/** A test can confirm when its likeliest outcome under the leading cause is this many times likelier than under the rest. */
const CONFIRMS = 3;

/** Causes the circuit model realises as an open: a broken wire or an open sensor element. */
export function isOpenCause(id: string): boolean {
  return (faultsFor(id) ?? []).some((f) => f.kind === 'open' || (f.kind === 'sensor_internal' && f.variant === 'open_track'));
}

/** Leads on a back-probed connector: the reading hangs on the probe reaching the terminal. */
export function backprobed(test: Pick<Test, 'request'>): boolean {
  return test.request.connector === 'backprobed' || (test.request.againstLocation !== undefined && test.request.otherConnector === 'backprobed');
}

/** The leader's likeliest outcome of test `t` against the other causes, weighed by their posterior among themselves. */
function canConfirm(model: PolicyModel, p: Float64Array, t: number, leader: number): boolean {
  const { nO, like } = model.tests[t]!;
  let best = 0;
  for (let o = 1; o < nO; o++) if (like[leader * nO + o]! > like[leader * nO + best]!) best = o;
  let rest = 0;
  let mass = 0;
  for (let h = 0; h < model.nH; h++) {
    if (h === leader) continue;
    rest += p[h]! * like[h * nO + best]!;
    mass += p[h]!;
  }
  return mass > 0 && like[leader * nO + best]! > CONFIRMS * (rest / mass);
}

/** The status rule: undefined (pass) unless an open is about to be concluded on an unconfirmed back-probe. */
export function backprobeConfirmation(ctx: RuleContext): Decision | undefined {
  const leader = argmax(ctx.posterior.p);
  const cause = ctx.tree.hypotheses[leader]!;
  if (ctx.posterior.p[leader]! < ctx.options.concludeAt || !isOpenCause(cause.id)) return undefined;
  const testOf = new Map(ctx.evidence.flatMap((e) => e.readingIds.map((id) => [id, e] as const)));
  const arguing = readingFactors(ctx.tree, ctx.posterior, leader).filter((f) => f.factor > ARGUES_FOR);
  const confirmed = arguing.some((f) =>
    f.ids.some((id) => {
      const e = testOf.get(id);
      return e && (!backprobed(ctx.tree.tests[e.test]!) || e.readingIds.length > 1);
    }),
  );
  const probed = arguing.flatMap((f) => f.ids.map((id) => testOf.get(id)).filter((e) => e && backprobed(ctx.tree.tests[e.test]!)));
  if (confirmed || probed.length === 0) return undefined;
  const candidates = openTests(ctx.state).filter((t) => !ctx.blocked?.has(t) && !backprobed(ctx.tree.tests[t]!) && canConfirm(ctx.model, ctx.state.p, t, leader));
  const test = ctx.tree.tests[candidates.length ? cheapestTest(ctx, candidates) : probed[0]!.test]!;
  const message = `"${cause.label}" rests on back-probed readings only, and a probe that misses its terminal reads like an open: ${
    candidates.length ? `confirm with "${test.label}" before concluding` : `back-probe "${test.label}" again, checking the probe reaches the terminal`
  }`;
  return proposeTest(ctx, test.index, finding('diagnosis.backprobe_unconfirmed', 'readings', message, 'info'));
}

/**
 * A healthy thermistor on a cold-soaked engine (down to −40 °C, the lowest SAE J1979 PID 05 reports) is hundreds of
 * kΩ, so every voltage on its signal sits near the pull-up's open-circuit value, as an open element's does. An open
 * thermistor is therefore concluded only on an ohms reading that argues for it (an open reads megohms or overload, a
 * cold sensor does not); until then the cheapest ohms test that can confirm it is proposed.
 */
export function thermistorOpenConfirmation(ctx: RuleContext): Decision | undefined {
  if (ctx.tree.circuitKind !== 'two_wire_thermistor') return undefined;
  const leader = argmax(ctx.posterior.p);
  const cause = ctx.tree.hypotheses[leader]!;
  const openElement = (faultsFor(cause.id) ?? []).some((f) => f.kind === 'sensor_internal' && f.variant === 'open_track');
  if (ctx.posterior.p[leader]! < ctx.options.concludeAt || !openElement) return undefined;
  const ohms = (t: number) => ctx.tree.tests[t]!.request.quantity === 'ohms';
  const healthy = ctx.tree.healthyIndex;
  // Against the healthy circuit itself: a good ground reading argues against a ground fault, not against a cold sensor.
  if (readingArguesFor(ctx, leader, healthy, ARGUES_FOR, ohms)) return undefined;
  const candidates = openTests(ctx.state).filter((t) => !ctx.blocked?.has(t) && ohms(t) && canConfirm(ctx.model, ctx.state.p, t, leader));
  if (!candidates.length) return undefined;
  const t = cheapestTest(ctx, candidates);
  return proposeTest(
    ctx,
    t,
    finding('diagnosis.thermistor_open_unconfirmed', 'readings', `a cold healthy thermistor reads like an open one on every voltage: confirm "${cause.label}" with "${ctx.tree.tests[t]!.label}" before concluding`, 'info'),
  );
}
