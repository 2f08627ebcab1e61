/**
 * Cross-reference checks on a shape-valid tree document. Each check is an entry in a table and returns coded,
 * path-addressed findings; loading runs them all and refuses the tree on any error.
 */
import { finding, joinPath, type Finding } from './findings';
import { checkCondition, conditionInterval } from './outcome-rules';
import { cautionKind } from './cautions';
import { requestKey } from './request-key';
import { checkJumperSafety } from './safety-rules';
import { QUANTILE_LEVELS } from './predictive';
import type { TreeDocument } from './tree-schema';
import { checkComparisons } from './comparison-checks';

interface TreeCheck {
  name: string;
  run(doc: TreeDocument): Finding[];
  /** Checks added after trees were first stored: a stored document only warns (the engine enforces them anyway). */
  relaxedWhenStored?: boolean;
}

const RUNNING_ENGINE: readonly string[] = ['cranking', 'running'];
const ENGINE_TURNING = 'engine_turning';

function duplicates(ids: string[]): Array<[string, number]> {
  const seen = new Set<string>();
  return ids.flatMap((id, i) => (seen.has(id) ? [[id, i] as [string, number]] : (seen.add(id), [])));
}

export const TREE_CHECKS: readonly TreeCheck[] = [
  {
    name: 'unique ids',
    run: (doc) => [
      ...duplicates(doc.hypotheses.map((h) => h.id)).map(([id, i]) => finding('tree.duplicate_id', joinPath('hypotheses', i, 'id'), `hypothesis id "${id}" is used twice`)),
      ...duplicates(doc.tests.map((t) => t.id)).map(([id, i]) => finding('tree.duplicate_id', joinPath('tests', i, 'id'), `test id "${id}" is used twice`)),
      ...duplicates(doc.setups.map((s) => s.id)).map(([id, i]) => finding('tree.duplicate_id', joinPath('setups', i, 'id'), `set-up id "${id}" is used twice`)),
      ...doc.tests.flatMap((t, ti) =>
        duplicates(t.outcomes.map((o) => o.id)).map(([id, i]) => finding('tree.duplicate_id', joinPath('tests', ti, 'outcomes', i, 'id'), `outcome id "${id}" is used twice`)),
      ),
    ],
  },
  {
    name: 'one unknown hypothesis',
    run: (doc) => {
      const leaks = doc.hypotheses.flatMap((h, i) => (h.unknown ? [i] : []));
      if (leaks.length === 1) return [];
      if (leaks.length === 0)
        return [finding('tree.no_unknown_hypothesis', 'hypotheses', 'add one hypothesis with "unknown": true (a cause the tree does not model), so the engine never forces a wrong answer')];
      return leaks.slice(1).map((i) => finding('tree.several_unknown_hypotheses', joinPath('hypotheses', i, 'unknown'), 'only one hypothesis may be the "unknown" leak'));
    },
  },
  {
    name: 'distinct requests',
    run: (doc) => {
      const seen = new Map<string, string>();
      return doc.tests.flatMap((t, i) => {
        // A comparison is told apart by its pair of requests; each half may also be a test of its own.
        const key = t.compare ? `${requestKey(t.request)}−${requestKey(t.compare.request)}` : requestKey(t.request);
        const other = seen.get(key);
        seen.set(key, t.id);
        return other ? [finding('tree.duplicate_request', joinPath('tests', i, 'request'), `test "${t.id}" asks for the same measurement as "${other}": a reading could not tell them apart`)] : [];
      });
    },
  },
  {
    name: 'set-ups and cautions exist',
    run: (doc) => {
      const setups = new Set(doc.setups.map((s) => s.id));
      return doc.tests.flatMap((t, i) => [
        ...t.setups.flatMap((s, j) => (setups.has(s) ? [] : [finding('tree.unknown_setup', joinPath('tests', i, 'setups', j), `no set-up with id "${s}"`)])),
        ...t.cautions.flatMap((c, j) => (cautionKind(c) ? [] : [finding('tree.unknown_caution', joinPath('tests', i, 'cautions', j), `no caution with id "${c}"`)])),
      ]);
    },
  },
  {
    // Any test with the engine cranking or running says so on its own: loading would add the caution, but a tree that
    // forgot it was written without the running engine in mind.
    name: 'running-engine cautions',
    relaxedWhenStored: true,
    run: (doc) =>
      doc.tests.flatMap((t, i) =>
        RUNNING_ENGINE.includes(t.request.engine) && !t.cautions.includes(ENGINE_TURNING)
          ? [
              finding(
                'tree.running_engine_caution_missing',
                joinPath('tests', i, 'cautions'),
                `test "${t.id}" has the engine ${t.request.engine}: list the "${ENGINE_TURNING}" caution (exhaust ventilated, parking brake set, transmission in park or neutral, hands, leads and clothing clear of belts and fans)`,
              ),
            ]
          : [],
      ),
  },
  {
    name: 'outcome conditions',
    run: (doc) => doc.tests.flatMap((t, i) => t.outcomes.flatMap((o, j) => checkCondition(o.condition, joinPath('tests', i, 'outcomes', j, 'condition')))),
  },
  {
    name: 'guard bands between outcomes',
    run: (doc) =>
      doc.tests.flatMap((t, i) => {
        const ranges = t.outcomes.map((o, j) => ({ j, r: conditionInterval(o.condition) }));
        if (ranges.some((x) => !x.r)) return [];
        const sorted = [...ranges].sort((a, b) => a.r!.lo - b.r!.lo);
        return sorted.slice(1).flatMap((cur, k) => {
          const prev = sorted[k]!;
          const path = joinPath('tests', i, 'outcomes', cur.j, 'condition');
          if (cur.r!.lo < prev.r!.hi)
            return [finding('tree.outcomes_overlap', path, `outcome "${t.outcomes[cur.j]!.id}" overlaps "${t.outcomes[prev.j]!.id}": a reading could match both`)];
          if (cur.r!.lo === prev.r!.hi)
            return [finding('tree.no_guard_band', path, `no guard band between "${t.outcomes[prev.j]!.id}" and "${t.outcomes[cur.j]!.id}": a reading on the edge decides on meter noise`, 'warning')];
          return [];
        });
      }),
  },
  {
    name: 'likelihood rows',
    run: (doc) => {
      const hyps = new Map(doc.hypotheses.map((h) => [h.id, h]));
      return doc.tests.flatMap((t, i) => {
        const path = joinPath('tests', i, 'likelihoods');
        const outcomes = new Set(t.outcomes.map((o) => o.id));
        const missing = doc.hypotheses
          .filter((h) => !h.unknown && !(h.id in t.likelihoods))
          .map((h) => finding('tree.likelihood_row_missing', joinPath(path, h.id), `no P(outcome | ${h.id}) row for test "${t.id}"`));
        const rows = Object.entries(t.likelihoods).flatMap(([hid, row]) => {
          if (!hyps.has(hid)) return [finding('tree.likelihood_unknown_hypothesis', joinPath(path, hid), `no hypothesis with id "${hid}"`)];
          const bad = Object.keys(row).filter((o) => !outcomes.has(o)).map((o) => finding('tree.likelihood_unknown_outcome', joinPath(path, hid, o), `test "${t.id}" has no outcome "${o}"`));
          const sum = Object.values(row).reduce((a, b) => a + b, 0);
          if (sum <= 0) bad.push(finding('tree.likelihood_row_empty', joinPath(path, hid), 'the row must give some probability to at least one outcome'));
          else if (Math.abs(sum - 1) > 0.05)
            bad.push(finding('tree.likelihood_row_not_normalised', joinPath(path, hid), `row sums to ${sum.toFixed(3)}; it was renormalised`, 'warning'));
          return bad;
        });
        const bands = Object.keys(t.bands ?? {}).filter((hid) => !hyps.has(hid)).map((hid) => finding('tree.bands_unknown_hypothesis', joinPath('tests', i, 'bands', hid), `no hypothesis with id "${hid}"`));
        return [...missing, ...rows, ...bands];
      });
    },
  },
  { name: 'comparisons', run: checkComparisons },
  { name: 'jumper safety', run: checkJumperSafety, relaxedWhenStored: true },
  {
    name: 'predictive cells',
    run: (doc) => {
      const nClasses = doc.derivation?.classes?.length ?? doc.derivation?.variants?.length ?? 1;
      const hyps = new Set(doc.hypotheses.map((h) => h.id));
      return doc.tests.flatMap((t, i) => {
        if (!t.predictive) return [];
        const path = joinPath('tests', i, 'predictive');
        const { cells, index } = t.predictive;
        const bad = cells.flatMap((c, k) =>
          (c.q.length === QUANTILE_LEVELS.length || (c.q.length === 0 && c.overload === 1)) && c.q.every((x, j) => j === 0 || x >= c.q[j - 1]!)
            ? []
            : [finding('tree.predictive_cell_invalid', joinPath(path, 'cells', k, 'q'), `expected ${QUANTILE_LEVELS.length} non-decreasing quantiles (or none with overload 1)`)],
        );
        for (const [hid, row] of Object.entries(index)) {
          if (!hyps.has(hid)) bad.push(finding('tree.predictive_unknown_hypothesis', joinPath(path, 'index', hid), `no hypothesis with id "${hid}"`));
          else if (row.length !== nClasses * (doc.derivation?.alternatives?.[hid]?.length ?? 1))
            bad.push(finding('tree.predictive_classes_mismatch', joinPath(path, 'index', hid), `expected one cell per class (${nClasses}) and alternative of the cause, got ${row.length}`));
          else if (row.some((k) => k >= cells.length)) bad.push(finding('tree.predictive_cell_missing', joinPath(path, 'index', hid), `a cell index beyond the ${cells.length} cells`));
        }
        return bad;
      });
    },
  },
  {
    name: 'parts named by repairs',
    run: (doc) => {
      const parts = new Set(doc.hypotheses.map((h) => h.repair.part));
      return doc.tests.flatMap((t, i) =>
        (t.parts ?? []).flatMap((p, j) => (parts.has(p) ? [] : [finding('tree.unknown_part', joinPath('tests', i, 'parts', j), `no hypothesis is repaired on part "${p}"`, 'warning')])),
      );
    },
  },
];
