/**
 * Proof-of-repair PDF rendering time: a typical three-page proof, the fuller sample, and a proof with 200
 * diagnostic readings. Median over repeated runs after warm-up (the first render also loads fonts and code).
 * Target: the typical proof under 150 ms on the 2-core machine.
 */
import { renderProofDetailed, type ProofView } from '../src/proof-render';
import { manyReadingsView, sampleView, typicalView } from '../test/proof-render/fixtures';
import type { BenchResult } from './run';

const TARGET_MS = 150;

async function measure(view: ProofView, runs: number): Promise<{ median: number; min: number; p90: number; pages: number; kb: number }> {
  let pages = 0;
  let bytes = 0;
  for (let i = 0; i < 3; i++) await renderProofDetailed(view); // warm-up
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const start = performance.now();
    const out = await renderProofDetailed(view);
    times.push(performance.now() - start);
    pages = out.pageCount;
    bytes = out.pdf.length;
  }
  times.sort((a, b) => a - b);
  const at = (q: number) => times[Math.min(times.length - 1, Math.floor(q * times.length))]!;
  return { median: at(0.5), min: times[0]!, p90: at(0.9), pages, kb: bytes / 1024 };
}

export default async (): Promise<BenchResult> => {
  const cases: Array<[string, ProofView, number, number | null]> = [
    ['typical proof (4 tests, 2 checks)', typicalView(), 30, TARGET_MS],
    ['sample proof (7 tests, 5 checks, 2 circuits)', sampleView(), 30, null],
    ['200 diagnostic readings, 12 checks', manyReadingsView(200), 12, null],
  ];
  const rows: BenchResult['rows'] = [];
  for (const [name, view, runs, target] of cases) {
    const r = await measure(view, runs);
    rows.push({
      proof: name,
      pages: r.pages,
      'PDF size (KiB)': r.kb.toFixed(0),
      runs,
      'median (ms)': r.median.toFixed(1),
      'min (ms)': r.min.toFixed(1),
      'p90 (ms)': r.p90.toFixed(1),
      target: target === null ? '—' : `< ${target} ms: ${r.median < target ? 'met' : 'NOT met'}`,
    });
  }
  return {
    title: 'Proof-of-repair PDF rendering (validate + digest + layout + pdfkit, A4)',
    rows,
    notes: ['Times include validation and the SHA-256 digest; fonts are parsed and subset anew for every document.'],
  };
};
