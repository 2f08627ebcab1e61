import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { join } from 'node:path';
import QRCode from 'qrcode';
import { afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { CAUTION_TEXT, evidenceDigest, proofDigest, qrPayload, renderProof, renderProofDetailed, type ProofView, type RenderedProof } from '../../src/proof-render';
import { MARGIN } from '../../src/proof-render/theme';
import { cleanUp, rasterise, readPdf, readPgm, type PdfRead } from './pdf-tools';
import { approvedOnItsEvidence, manyReadingsView, notVerifiedView, rd, sampleView } from './fixtures';

const sha = (b: Buffer) => createHash('sha256').update(b).digest('hex');
// pdfjs hands text back NFKC-normalised (the micro sign U+00B5 comes back as Greek mu U+03BC), so compare that way.
const nfkc = (s: string) => s.normalize('NFKC');
const allText = (read: PdfRead) => nfkc(read.pages.map((p) => p.text).join('\n'));

/** Every reading a view states: diagnosis, corrections, verification before and after. */
function readingsOf(view: ProofView): string[] {
  return [
    ...view.diagnosis.flatMap((s) => [s.reading.entered, ...s.superseded.map((x) => x.reading.entered)]),
    ...view.verification.flatMap((c) => [...(c.before ? [c.before.entered] : []), c.after.entered, ...c.superseded.map((x) => x.reading.entered)]),
  ];
}

let sample: RenderedProof;
let sampleRead: PdfRead;

beforeAll(async () => {
  sample = await renderProofDetailed(sampleView());
  sampleRead = await readPdf(sample.pdf);
});

afterEach(() => {
  vi.useRealTimers();
});

describe('what the proof states, read back with pdfjs-dist', () => {
  it('holds the VIN, the repair order number and the root cause', () => {
    const text = allText(sampleRead);
    const view = sampleView();
    expect(text).toContain(view.vehicle.vin);
    expect(text).toContain(view.repairOrder.number);
    expect(text.replace(/\s+/g, ' ')).toContain('Open in the signal wire between throttle position sensor 1 and the module');
    expect(text).toContain('96.2 %');
  });

  it('holds every reading as entered, corrections included', () => {
    const items = sampleRead.pages.flatMap((p) => p.items.map((i) => nfkc(i.str)));
    for (const reading of readingsOf(sampleView())) expect(items).toContain(nfkc(reading));
  });

  it('prints the digest recomputed from the view, in full', () => {
    // The document's digest once; the evidence digest (what the approval was given on) beside the sign-off.
    const printed = allText(sampleRead).match(/\b[0-9a-f]{64}\b/g);
    expect(printed).toContain(proofDigest(sampleView()));
    expect(new Set(printed)).toEqual(new Set([proofDigest(sampleView()), evidenceDigest(sampleView())]));
    expect(sample.digest).toBe(proofDigest(sampleView()));
  });

  it('numbers every page "Page n of m"', () => {
    const m = sampleRead.pages.length;
    expect(m).toBe(sample.pageCount);
    sampleRead.pages.forEach((page, i) => expect(page.text).toContain(`Page ${i + 1} of ${m}`));
  });

  it('prints Ω, °C, µ, ≤ and the corrections of the 200-reading proof as text (not as missing glyphs)', async () => {
    const read = await readPdf(await renderProof(manyReadingsView(200)));
    const text = allText(read);
    for (const s of ['253 kΩ', '83 °C', '0.6 µA', '≤ 5 µA', '200 – 300 kΩ', '8.4 mA']) expect(text).toContain(nfkc(s));
  });

  it.each([
    ['the sample', sampleView()],
    ['the proof that is not verified', notVerifiedView()],
  ])('shows the applicable cautions of %s and the line that service information takes precedence', async (_name, view) => {
    const text = allText(await readPdf(await renderProof(view)));
    for (const code of view.cautions) expect(text).toContain(CAUTION_TEXT[code].lead);
    expect(text).not.toContain(CAUTION_TEXT.high_voltage_system.lead);
    expect(text).not.toContain(CAUTION_TEXT.no_ohmmeter_on_airbag.lead);
    expect(text).toContain("The vehicle manufacturer's service information and local regulations take precedence");
  });

  it('marks a proof without after-repair readings "NOT VERIFIED" instead of printing an empty table', async () => {
    const read = await readPdf(await renderProof(notVerifiedView()));
    const text = allText(read);
    expect(text).toContain('NOT VERIFIED');
    expect(text).not.toContain('Test repeated and conditions');
    expect(text).not.toContain('Before and after, by circuit');
    expect(text).toContain('NOT YET APPROVED');
    expect(text.match(/Not signed/g)).toHaveLength(2);
  });

  it('shows a returned proof as not yet approved, with the foreman\'s comment', async () => {
    const view = sampleView();
    view.signOff.decisions.pop();
    view.signOff.foremanSignedAt = null;
    const text = allText(await readPdf(await renderProof(view)));
    expect(text).toContain('NOT YET APPROVED: returned for rework by Idunn Carrow');
    expect(text).toContain('Add the scan-tool throttle reading after the repair');
  });

  it('marks a failed check FAIL and the proof as failed', async () => {
    const view = sampleView();
    view.verification[0]!.after = rd('7.5 Ω', 7.5, 'Ω', 7.5, 'Ω');
    view.verification[0]!.pass = false;
    view.signOff.foremanSignedAt = null;
    const text = allText(await readPdf(await renderProof(view))).replace(/\s+/g, ' ');
    expect(text).toContain('VERIFICATION FAILED: 1 of 5 checks outside the healthy range');
    // The approval was given on the evidence before this change: it is stale, not a signature.
    expect(text).toContain('APPROVAL STALE');
    expect(text).toContain('FAIL');
  });
});

describe('codes after the repair, as the proof states them', () => {
  const codesAfter = (afterRepair: ProofView['troubleCodes']['afterRepair']): ProofView => approvedOnItsEvidence({ ...sampleView(), troubleCodes: { ...sampleView().troubleCodes, afterRepair } });
  const checkedAt = '2025-03-11T13:30:00-05:00';
  it.each([
    ['nobody recorded them', { check: null, codes: [] }, 'NOT RECORDED'],
    ['cleared and three key cycles, none back', { check: { method: 'cleared_then_key_cycles' as const, keyCycles: 3, checkedAt }, codes: [] }, 'Codes cleared, none returned after 3 key cycles'],
    ['cleared and one key cycle, none back', { check: { method: 'cleared_then_key_cycles' as const, keyCycles: 1, checkedAt }, codes: [] }, 'Codes cleared, none returned after 1 key cycle'],
    ['cleared and a road test, none back', { check: { method: 'road_test' as const, keyCycles: null, checkedAt }, codes: [] }, 'Codes cleared, none returned after a road test'],
    ['a code back after a road test', { check: { method: 'road_test' as const, keyCycles: null, checkedAt }, codes: [{ code: 'P0122', description: 'TP A low input', status: 'current' }] }, 'P0122'],
  ])('when %s, says %j', async (_name, afterRepair, words) => {
    const text = allText(await readPdf(await renderProof(codesAfter(afterRepair as ProofView['troubleCodes']['afterRepair'])))).replace(/\s+/g, ' ');
    expect(text).toContain(words);
    if (afterRepair.check === null) expect(text).not.toContain('none returned');
    else expect(text).not.toContain('NOT RECORDED');
  });
});

describe('layout', () => {
  it('keeps every line inside the margins and above the footer, on A4 and on Letter', async () => {
    for (const paper of ['A4', 'LETTER'] as const) {
      const read = await readPdf(await renderProof(manyReadingsView(60), { paper }));
      for (const page of read.pages) {
        expect([page.width, page.height]).toEqual(paper === 'A4' ? [595.28, 841.89] : [612, 792]);
        const footerTop = MARGIN.bottom + MARGIN.footer; // PDF y (from the bottom) of the lowest point flow content reaches
        for (const item of page.items) {
          expect(item.x).toBeGreaterThanOrEqual(MARGIN.side - 0.5);
          expect(item.x + item.width).toBeLessThanOrEqual(page.width - MARGIN.side + 0.5);
          const isFooter = item.str.startsWith('Proof of repair · ') || /^Page \d+ of \d+$/.test(item.str);
          if (isFooter) expect(item.y).toBeLessThan(footerTop - 10);
          else expect(item.y).toBeGreaterThan(footerTop - 1);
        }
      }
    }
  });

  it('paginates 200 readings with the table header on every continued page and no row split, lost or repeated', async () => {
    const view = manyReadingsView(200);
    const read = await readPdf(await renderProof(view));
    // Each diagnostic row carries its own time stamp (unique in this view; the verification stamps are later).
    const stampOf = (at: string) => `${at.slice(0, 10)} ${at.slice(11, 16)}`;
    const pageOf = (step: ProofView['diagnosis'][number]) => {
      const pages = read.pages.map((p, i) => (p.items.some((it) => it.str.includes(stampOf(step.takenAt))) ? i : -1)).filter((i) => i >= 0);
      expect(pages, `row ${step.seq} found on pages ${pages.join(', ')}`).toHaveLength(1);
      return pages[0]!;
    };
    const pages = view.diagnosis.map(pageOf);
    // Rows keep their order, and a row's title sits on the page of its time stamp (the row was not split).
    pages.forEach((page, i) => {
      if (i > 0) expect(page).toBeGreaterThanOrEqual(pages[i - 1]!);
      const flowing = `${read.pages[page]!.items.map((it) => it.str).join(' ')} `; // a wrapped title joins back at its spaces
      expect(flowing.includes(`${view.diagnosis[i]!.title} `), `row ${i + 1} split`).toBe(true);
    });
    const used = [...new Set(pages)];
    expect(used.length).toBeGreaterThan(5);
    expect(read.pages[used[0]!]!.text).not.toContain('Diagnostic path (continued)');
    for (const page of used.slice(1)) {
      expect(read.pages[page]!.text).toContain('Diagnostic path (continued)');
      expect(read.pages[page]!.text).toContain('Test and conditions');
    }
  });

  it('renders a step with the longest note the API accepts and its twenty corrections, continuing it onto the next pages', async () => {
    const view = sampleView();
    const step = view.diagnosis[2]!;
    step.note = 'word '.repeat(399) + 'end.';
    const correction = step.superseded[0]!;
    step.superseded = Array.from({ length: 20 }, () => ({ ...correction, reason: 'r '.repeat(998) + 'end' }));
    const rendered = await renderProofDetailed(approvedOnItsEvidence(view));
    const read = await readPdf(rendered.pdf);
    expect(allText(read)).toContain('Correction 20:');
    expect(rendered.pageCount).toBeGreaterThan(sample.pageCount + 2);
  });

  it('draws charts and the QR code as vector paths: the file holds no image', () => {
    expect(sample.pdf.includes('/Subtype /Image')).toBe(false);
  });
});

describe('deterministic output', () => {
  it('gives byte-identical PDFs for the same view, whatever the clock says', async () => {
    vi.useFakeTimers({ toFake: ['Date'] });
    vi.setSystemTime(new Date('2031-07-04T12:00:00Z'));
    const later = await renderProof(sampleView());
    vi.setSystemTime(new Date('2001-01-01T00:00:00Z'));
    const earlier = await renderProof(sampleView());
    expect(sha(later)).toBe(sha(sample.pdf));
    expect(sha(earlier)).toBe(sha(sample.pdf));
  });

  it('gives the same bytes in a separate Node process', () => {
    const tsx = join(process.cwd(), 'node_modules', '.bin', 'tsx');
    const child = execFileSync(tsx, [join(__dirname, 'render-in-child.ts')], { encoding: 'utf8', timeout: 60_000 });
    expect(child).toBe(sha(sample.pdf));
  });

  it('takes its dates from the view and its file /ID from the content, not from the clock or chance', async () => {
    expect(sampleRead.info.CreationDate).toBe('D:20250311195000Z'); // 14:50 −05:00, the foreman's approval
    expect(sampleRead.info.ModDate).toBe('D:20250311195000Z');
    const id = (pdf: Buffer) => /\/ID \[<([0-9a-f]+)> <([0-9a-f]+)>\]/.exec(pdf.toString('latin1'))?.[1];
    const changed = sampleView();
    changed.diagnosis[1]!.reading = rd('5.02 V', 5.02, 'V', 5.02, 'V');
    const other = approvedOnItsEvidence(changed);
    expect(id(sample.pdf)).toMatch(/^[0-9a-f]{32}$/);
    expect(id(await renderProof(sampleView()))).toBe(id(sample.pdf));
    expect(id(await renderProof(other))).not.toBe(id(sample.pdf));
  });
});

describe('in a real renderer (poppler pdftoppm)', () => {
  it('rasterises to one PNG per page', () => {
    const { dir, files } = rasterise(sample.pdf, ['-r', '40', '-png']);
    try {
      expect(files).toHaveLength(sample.pageCount);
      expect(files.every((f) => f.endsWith('.png'))).toBe(true);
    } finally {
      cleanUp(dir);
    }
  });

  it('shows the QR code with exactly the modules of the digest\'s QR symbol', () => {
    const dpi = 216; // 3 px per point
    const page = sample.qr.page;
    const { dir, files } = rasterise(sample.pdf, ['-r', String(dpi), '-gray', '-f', String(page), '-l', String(page)]);
    try {
      const image = readPgm(join(dir, files[0]!));
      const matrix = QRCode.create(qrPayload(sample.digest), { errorCorrectionLevel: 'M' }).modules;
      expect(sample.qr.size).toBe(matrix.size);
      const px = dpi / 72;
      let mismatches = 0;
      for (let row = -1; row <= matrix.size; row++) {
        for (let col = -1; col <= matrix.size; col++) {
          const inside = row >= 0 && col >= 0 && row < matrix.size && col < matrix.size;
          const dark = inside && matrix.get(row, col) === 1; // the ring outside is quiet zone: light
          const x = Math.round((sample.qr.x + (col + 0.5) * sample.qr.module) * px);
          const y = Math.round((sample.qr.y + (row + 0.5) * sample.qr.module) * px);
          if ((image.pixel(x, y) < 128) !== dark) mismatches++;
        }
      }
      expect(mismatches).toBe(0);
    } finally {
      cleanUp(dir);
    }
  });
});
