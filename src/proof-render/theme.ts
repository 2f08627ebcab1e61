/**
 * Fonts, sizes, colours and page geometry of the proof. Sizes are chosen to read at arm's length on a tablet and on
 * paper; colours are black and greys with one dark red and one dark green, always beside a word, never alone.
 */
import { join } from 'node:path';
import type { PaperSize } from './view';

/** DejaVu fonts from the `dejavu-fonts-ttf` package (Ω, °, µ, ≤, ±, − all present). */
function fontDir(): string {
  return join(require.resolve('dejavu-fonts-ttf/package.json'), '..', 'ttf');
}

export const FONT_FILES = {
  sans: 'DejaVuSans.ttf',
  bold: 'DejaVuSans-Bold.ttf',
  mono: 'DejaVuSansMono.ttf',
} as const;
export type FontKey = keyof typeof FONT_FILES;

let fontPaths: Record<FontKey, string> | null = null;
/** Absolute font paths; pdfkit caches a font by the name it was opened with, so these paths are the names. */
export function fonts(): Record<FontKey, string> {
  if (!fontPaths) {
    const dir = fontDir();
    fontPaths = { sans: join(dir, FONT_FILES.sans), bold: join(dir, FONT_FILES.bold), mono: join(dir, FONT_FILES.mono) };
  }
  return fontPaths;
}

/** Page sizes in PostScript points (ISO 216 A4 = 210 × 297 mm; US Letter = 8.5 × 11 in). */
export const PAPER: Record<PaperSize, { width: number; height: number }> = {
  A4: { width: 595.28, height: 841.89 },
  LETTER: { width: 612, height: 792 },
};

export const SIZE = {
  title: 20,
  heading: 13,
  body: 10,
  table: 9.5,
  small: 8.5,
  footer: 8,
  lineGap: 1.28, // line height as a multiple of the font size
};

export const COLOR = {
  ink: '#000000',
  muted: '#3a3a3a', // still > 10:1 against white
  rule: '#6b6b6b',
  headFill: '#e4e4e4',
  bandFill: '#f3f3f3',
  chartBand: '#d4d4d4',
  pass: '#0b5d1e',
  fail: '#a3001b',
  white: '#ffffff',
};

export const MARGIN = { side: 44, top: 44, bottom: 40, footer: 24 };
