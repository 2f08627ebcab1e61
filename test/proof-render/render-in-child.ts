/**
 * Run by render.test.ts in a separate Node process: renders the sample proof and prints the SHA-256 of the PDF
 * bytes, so the test can compare a render made by a different process at a different time.
 */
import { createHash } from 'node:crypto';
import { renderProof } from '../../src/proof-render';
import { sampleView } from './fixtures';

void renderProof(sampleView(), { paper: process.argv[2] === 'LETTER' ? 'LETTER' : 'A4' }).then((pdf) => {
  process.stdout.write(createHash('sha256').update(pdf).digest('hex'));
});
