// A direction override kept in free text must not reorder what the proof prints: "Paid \u202E0001\u202C USD" used
// to read as "Paid 1000 USD"; the PDF prints the controls as marks instead (read back with pdfjs-dist).
import { describe, expect, it } from 'vitest';
import { renderProof } from '../../src/proof-render';
import { readPdf } from './pdf-tools';
import { approvedOnItsEvidence, sampleView } from './fixtures';

describe('free text with direction controls in the proof', () => {
  it('prints the controls as visible marks, in the order they were typed', async () => {
    const view = sampleView();
    view.diagnosis[0]!.note = 'Paid \u202E0001\u202C USD';
    // The foreman's approval is of the evidence as the document states it, note included.
    const read = await readPdf(await renderProof(approvedOnItsEvidence(view)));
    const text = read.pages.map((p) => p.text).join('\n');
    expect(text).toContain('Paid ⟨U+202E⟩0001⟨U+202C⟩ USD');
    expect(text).not.toContain('\u202E');
  });
});
