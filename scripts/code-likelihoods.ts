/**
 * Prints the code table with the likelihood each cause gives each code, derived from the built-in trees (the share of
 * the cause's predicted voltage in the code's window), as a Markdown table per tree. Nothing is written: the
 * numbers are recomputed by the engine whenever a diagnosis weighs codes.
 *
 *   npx tsx scripts/code-likelihoods.ts [three-wire-5v|two-wire-thermistor|shared-reference]
 */
import { CODE_TABLE } from '../src/engine/codes';
import { builtInTrees, codeLikelihoods } from '../src/engine/diagnosis';

const THERMISTOR_SENSORS = ['IAT', 'ECT'];
const only = process.argv[2];
for (const tree of Object.values(builtInTrees())) {
  if (only && tree.id !== only) continue;
  const rows = [...CODE_TABLE.values()].filter((row) =>
    tree.circuitKind === 'shared_5v_reference' ? row.monitor === 'reference' : row.monitor === 'reference' || THERMISTOR_SENSORS.includes(row.sensors[0]!) === (tree.circuitKind === 'two_wire_thermistor'),
  );
  console.log(`\n### ${tree.id}\n`);
  console.log(`| code | sensor | failure | window | ${tree.hypotheses.map((h) => h.id).join(' | ')} |`);
  console.log(`|${'---|'.repeat(4 + tree.hypotheses.length)}`);
  for (const row of rows) {
    const r = codeLikelihoods(tree, row.code);
    const cells = r.ok ? tree.hypotheses.map((h) => r.like[h.index]!.toFixed(3)) : tree.hypotheses.map(() => '—');
    console.log(`| ${row.code} | ${row.sensors.join(', ')} | ${row.failure} | ${r.ok ? r.window : r.reason} | ${cells.join(' | ')} |`);
  }
}
