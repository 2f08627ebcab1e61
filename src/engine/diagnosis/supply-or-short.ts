/**
 * A 5 V reference shorted to ground and a module supply that has failed read alike from the sensor connector: low
 * or no reference, plugged or unplugged, and a supply in current limit can sit at any voltage. What tells them apart
 * is the harness on its own, key off: the reference wire ohmed to ground reads the short (ohms) or the switched-off
 * supply and the module's loads (hundreds of ohms and up). So neither is concluded, and no module is condemned or
 * wire cut open, before an ohms reading argues for the leader against the other; until then the cheapest ohms test
 * that can tell them apart is proposed. Common practice, no source ("prove the harness before the module").
 */
import { finding } from './findings';
import { argmax, openTests } from './policy';
import { cheapestTest, proposeTest, readingArguesFor } from './propose-test';
import type { Decision, RuleContext } from './status-rules';

/** The pair read alike from the sensor connector. */
const PAIR = ['reference_short_ground', 'reference_supply_failed'] as const;
/** An ohms reading argues for the leader when it is this many times likelier under it than under the other. */
const ARGUES_FOR = 1.5;
/** An ohms test can tell them apart when its likeliest outcome under the leader is this many times likelier than under the other. */
const SEPARATES = 3;

export function supplyOrShortConfirmation(ctx: RuleContext): Decision | undefined {
  const leader = argmax(ctx.posterior.p);
  const cause = ctx.tree.hypotheses[leader]!;
  if (ctx.posterior.p[leader]! < ctx.options.concludeAt || !(PAIR as readonly string[]).includes(cause.id)) return undefined;
  const other = ctx.tree.hypotheses.find((h) => h.id !== cause.id && (PAIR as readonly string[]).includes(h.id));
  if (!other) return undefined;
  const ohms = (t: number) => ctx.tree.tests[t]!.request.quantity === 'ohms';
  if (readingArguesFor(ctx, leader, other.index, ARGUES_FOR, ohms)) return undefined;
  const separates = (t: number) => {
    const { nO, like } = ctx.model.tests[t]!;
    let best = 0;
    for (let o = 1; o < nO; o++) if (like[leader * nO + o]! > like[leader * nO + best]!) best = o;
    return like[leader * nO + best]! > SEPARATES * like[other.index * nO + best]!;
  };
  const candidates = openTests(ctx.state).filter((t) => !ctx.blocked?.has(t) && ohms(t) && separates(t));
  if (!candidates.length) return undefined;
  const t = cheapestTest(ctx, candidates);
  return proposeTest(
    ctx,
    t,
    finding('diagnosis.harness_unproven', 'readings', `"${cause.label}" and "${other.label}" read alike from the sensor connector: prove the harness with "${ctx.tree.tests[t]!.label}" before concluding`, 'info'),
  );
}
