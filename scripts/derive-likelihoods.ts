/**
 * Recomputes the predictive densities, likelihood tables and predicted-reading bands of the built-in fault trees
 * from the circuit model (fixed seed and sample count) and writes them back into the JSON documents. Trees whose circuit kind the model
 * does not know keep their hand-given tables.
 *
 *   npx tsx scripts/derive-likelihoods.ts [--check]
 *
 * `--check` only compares and exits non-zero when a stored table differs from the recomputation.
 */
import { readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { BUILT_IN_DERIVATION, deriveLikelihoods } from '../src/engine/diagnosis/derive-likelihoods';
import { parseTreeDocument } from '../src/engine/diagnosis/tree-schema';
import { canonicalJson } from '../src/engine/diagnosis/request-key';
import { builtInSharedReferenceTree, deriveAllSharedReferenceCells, SHARED_DERIVATION } from '../src/engine/diagnosis/shared-reference-tree';

const compact = (value: unknown) => `${JSON.stringify(value, null, 2).replace(/\[\s*(-?[\d.e+-]+(?:,\s*-?[\d.e+-]+)*)\s*\]/g, (_m, body: string) => `[${body.split(/,\s*/).join(', ')}]`)}\n`;

const dir = join(__dirname, '..', 'src', 'engine', 'trees');
const check = process.argv.includes('--check');
let differs = false;
// The shared reference's cells, by role, for every sensor count; its trees are laid out from them.
const cellsFile = join(dir, 'derived', 'shared-reference-cells.json');
const startedCells = Date.now();
const cells = deriveAllSharedReferenceCells(SHARED_DERIVATION);
const cellsSame = canonicalJson(cells) === canonicalJson(JSON.parse(readFileSync(cellsFile, 'utf8')));
differs ||= !cellsSame;
if (!check) writeFileSync(cellsFile, compact(cells));
console.log(`derived/shared-reference-cells.json: ${cellsSame ? 'unchanged' : check ? 'DIFFERS' : 'rewritten'} (${Date.now() - startedCells} ms)`);
for (const file of readdirSync(dir).filter((f) => f.endsWith('.json')).sort()) {
  const raw = JSON.parse(readFileSync(join(dir, file), 'utf8')) as unknown;
  const parsed = parseTreeDocument(raw);
  if (!parsed.document) {
    console.error(`${file}: does not parse`, parsed.findings.slice(0, 5));
    process.exitCode = 1;
    continue;
  }
  if (parsed.document.derivation?.method === 'hand' && parsed.document.circuitKind !== 'shared_5v_reference') {
    console.log(`${file}: hand-given likelihoods, left as they are`);
    continue;
  }
  const started = Date.now();
  const { document, findings } =
    parsed.document.circuitKind === 'shared_5v_reference' ? { document: builtInSharedReferenceTree(cells), findings: [] } : deriveLikelihoods(parsed.document, BUILT_IN_DERIVATION);
  for (const f of findings.filter((x) => x.severity !== 'info')) console.warn(`${file}: ${f.code} at ${f.path}: ${f.message}`);
  // Arrays of numbers (quantiles, class indices) on one line each keep the file readable and small.
  const text = compact(document);
  const same = canonicalJson(document) === canonicalJson(parsed.document);
  differs ||= !same;
  if (!check) writeFileSync(join(dir, file), text);
  console.log(`${file}: ${same ? 'unchanged' : check ? 'DIFFERS' : 'rewritten'} (${Date.now() - started} ms, ${findings.filter((f) => f.code === 'derive.cell_flat').length} flat cells)`);
}
if (check && differs) process.exitCode = 1;
