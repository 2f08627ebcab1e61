/**
 * Reading a rendered proof back the way a person or another program would: text per page through pdfjs-dist,
 * pages as pictures through poppler's pdftoppm.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export interface TextItem {
  str: string;
  /** Baseline origin in PDF points (y measured from the bottom of the page). */
  x: number;
  y: number;
  width: number;
}

export interface PageText {
  /** Item strings joined by newlines (each drawn line is one item). */
  text: string;
  items: TextItem[];
  width: number;
  height: number;
}

export interface PdfRead {
  pages: PageText[];
  info: Record<string, unknown>;
}

export async function readPdf(pdf: Buffer): Promise<PdfRead> {
  const pdfjs = await import('pdfjs-dist/legacy/build/pdf.mjs');
  const doc = await pdfjs.getDocument({ data: new Uint8Array(pdf), disableFontFace: true, useSystemFonts: false, verbosity: 0 }).promise;
  const pages: PageText[] = [];
  for (let n = 1; n <= doc.numPages; n++) {
    const page = await doc.getPage(n);
    const content = await page.getTextContent();
    const items: TextItem[] = [];
    for (const raw of content.items) {
      if (!('str' in raw) || raw.str.trim() === '') continue;
      items.push({ str: raw.str, x: raw.transform[4] as number, y: raw.transform[5] as number, width: raw.width });
    }
    const [, , width, height] = page.view as number[];
    pages.push({ text: items.map((i) => i.str).join('\n'), items, width: width!, height: height! });
  }
  const meta = await doc.getMetadata();
  await doc.destroy();
  return { pages, info: meta.info as Record<string, unknown> };
}

/** Render pages with pdftoppm into a fresh directory; returns the file names (sorted) and the directory. */
export function rasterise(pdf: Buffer, args: string[]): { dir: string; files: string[] } {
  const dir = mkdtempSync(join(tmpdir(), 'proof-raster-'));
  const input = join(dir, 'proof.pdf');
  writeFileSync(input, pdf);
  execFileSync('pdftoppm', [...args, input, join(dir, 'page')]);
  const files = readdirSync(dir).filter((f) => f.startsWith('page')).sort();
  return { dir, files };
}

export function cleanUp(dir: string): void {
  rmSync(dir, { recursive: true, force: true });
}

/** A binary PGM (P5, 8-bit) as written by `pdftoppm -gray`. */
export function readPgm(path: string): { width: number; height: number; pixel: (x: number, y: number) => number } {
  const data = readFileSync(path);
  // Header: "P5", width, height, maxval, each separated by whitespace, then one whitespace byte.
  const tokens: string[] = [];
  let i = 0;
  while (tokens.length < 4) {
    while (/\s/.test(String.fromCharCode(data[i]!))) i++;
    let token = '';
    while (!/\s/.test(String.fromCharCode(data[i]!))) token += String.fromCharCode(data[i++]!);
    tokens.push(token);
  }
  i++;
  if (tokens[0] !== 'P5' || tokens[3] !== '255') throw new Error(`not an 8-bit binary PGM: ${tokens.join(' ')}`);
  const width = Number(tokens[1]);
  const height = Number(tokens[2]);
  const start = i;
  return { width, height, pixel: (x, y) => data[start + y * width + x]! };
}
