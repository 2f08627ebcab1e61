/**
 * A small flow layout over pdfkit: our own line wrapping, explicit positions and explicit page breaks. pdfkit's
 * page margins are zero and every text call is a single line with `lineBreak: false`, so pdfkit never breaks a page
 * on its own and nothing can run into the footer: the only way onto a new page is `Flow.newPage`.
 */
import { showInvisible } from '../engine/text';
import type PDFDocument from 'pdfkit';
import { COLOR, MARGIN, SIZE, fonts, type FontKey } from './theme';

type Doc = InstanceType<typeof PDFDocument>;

/** One wrapped paragraph of a single style. */
export interface Block {
  text: string;
  font?: FontKey;
  size?: number;
  color?: string;
  /** Struck through (a superseded reading). */
  strike?: boolean;
  /** Drawn as a filled label (white text on `badge`). */
  badge?: string;
  /** Extra space above, in points. */
  gap?: number;
}

export interface LaidBlock extends Block {
  lines: string[];
  size: number;
  height: number;
}

export class Flow {
  y: number;
  readonly left: number;
  readonly right: number;
  readonly top: number;
  readonly bottom: number;
  pageCount = 0;

  constructor(
    readonly doc: Doc,
    readonly page: { width: number; height: number },
  ) {
    this.left = MARGIN.side;
    this.right = page.width - MARGIN.side;
    this.top = MARGIN.top;
    this.bottom = page.height - MARGIN.bottom - MARGIN.footer;
    this.y = this.top;
  }

  get width(): number {
    return this.right - this.left;
  }

  newPage(): void {
    this.doc.addPage({ size: [this.page.width, this.page.height], margin: 0 });
    this.pageCount += 1;
    this.y = this.top;
  }

  /** Start a new page unless `height` still fits; true when a page was started. */
  ensure(height: number): boolean {
    if (this.y + height <= this.bottom + 0.01) return false;
    this.newPage();
    return true;
  }

  lineHeight(size: number): number {
    return size * SIZE.lineGap;
  }

  /** Word widths by font and size: the same words come back in every row, and shaping them is the costly part. */
  private readonly widths = new Map<string, number>();

  private measureWord(word: string, font: FontKey, size: number): number {
    const key = `${font}\u0000${size}\u0000${word}`;
    let w = this.widths.get(key);
    if (w === undefined) {
      w = this.doc.font(fonts()[font]).fontSize(size).widthOfString(word);
      this.widths.set(key, w);
    }
    return w;
  }

  /**
   * Greedy word wrap on summed word widths (a half-point allowance covers kerning across the spaces); a word wider
   * than the line is cut between characters. Explicit newlines are kept.
   */
  wrap(text: string, font: FontKey, size: number, width: number): string[] {
    // Direction controls and zero-width characters are printed as marks: they must not reorder or hide what is read.
    text = showInvisible(text);
    const limit = width - 0.5;
    const space = this.measureWord(' ', font, size);
    const lines: string[] = [];
    for (const paragraph of text.split(/\r\n|[\n\r\u2028\u2029]/)) {
      const words = paragraph.split(/[ \t]+/).filter((w) => w.length > 0);
      if (words.length === 0) {
        lines.push('');
        continue;
      }
      let line = '';
      let lineWidth = 0;
      for (const word of words) {
        const w = this.measureWord(word, font, size);
        if (line && lineWidth + space + w <= limit) {
          line = `${line} ${word}`;
          lineWidth += space + w;
          continue;
        }
        if (line) lines.push(line);
        let rest = word;
        let restWidth = w;
        while (restWidth > limit) {
          // The longest head that fits, found by halving (a word can be thousands of characters long).
          let lo = 1;
          let hi = rest.length - 1;
          while (lo < hi) {
            const mid = Math.ceil((lo + hi) / 2);
            if (this.doc.font(fonts()[font]).fontSize(size).widthOfString(rest.slice(0, mid)) <= limit) lo = mid;
            else hi = mid - 1;
          }
          const cut = Math.max(1, lo);
          lines.push(rest.slice(0, cut));
          rest = rest.slice(cut);
          restWidth = this.doc.font(fonts()[font]).fontSize(size).widthOfString(rest);
        }
        line = rest;
        lineWidth = restWidth;
      }
      lines.push(line);
    }
    return lines;
  }

  width_(text: string, font: FontKey, size: number): number {
    return this.measureWord(text, font, size);
  }

  lay(block: Block, width: number): LaidBlock {
    const size = block.size ?? SIZE.body;
    const font = block.font ?? 'sans';
    const inner = block.badge ? width - 8 : width;
    const lines = this.wrap(block.text, font, size, inner);
    const padding = block.badge ? 4 : 0;
    return { ...block, font, size, lines, height: (block.gap ?? 0) + lines.length * this.lineHeight(size) + padding };
  }

  /** Draw one already wrapped block at (x, y); returns its height. */
  drawBlock(b: LaidBlock, x: number, y: number, width: number): number {
    const lh = this.lineHeight(b.size);
    let cy = y + (b.gap ?? 0);
    const font = fonts()[b.font ?? 'sans'];
    if (b.badge) {
      const w = Math.min(width, Math.max(...b.lines.map((l) => this.width_(l, b.font ?? 'sans', b.size))) + 8);
      this.doc.save().rect(x, cy, w, b.lines.length * lh + 4).fill(b.badge).restore();
      cy += 2;
      x += 4;
    }
    for (const line of b.lines) {
      this.doc.font(font).fontSize(b.size).fillColor(b.badge ? COLOR.white : (b.color ?? COLOR.ink));
      this.doc.text(line, x, cy + (lh - b.size) / 2, { lineBreak: false });
      if (b.strike && line) {
        const w = this.doc.widthOfString(line);
        const sy = cy + (lh - b.size) / 2 + b.size * 0.6;
        this.doc.save().moveTo(x, sy).lineTo(x + w, sy).lineWidth(0.9).strokeColor(b.color ?? COLOR.ink).stroke().restore();
      }
      cy += lh;
    }
    return b.height;
  }

  /** A paragraph that may continue on the next page, line by line. */
  paragraph(block: Block, x = this.left, width = this.width): void {
    const laid = this.lay(block, width);
    const lh = this.lineHeight(laid.size);
    this.y += laid.gap ?? 0;
    for (const line of laid.lines) {
      this.ensure(lh);
      this.drawBlock({ ...laid, gap: 0, lines: [line], height: lh }, x, this.y, width);
      this.y += lh;
    }
  }

  rule(y = this.y, weight = 0.8, color: string = COLOR.rule): void {
    this.doc.save().moveTo(this.left, y).lineTo(this.right, y).lineWidth(weight).strokeColor(color).stroke().restore();
  }

  /** Text on one line in the footer area (below `bottom`), which flow content never reaches. */
  footerText(shown: string, x: number, y: number, align: 'left' | 'right', font: FontKey = 'sans'): void {
    const text = showInvisible(shown);
    this.doc.font(fonts()[font]).fontSize(SIZE.footer).fillColor(COLOR.muted);
    const w = this.doc.widthOfString(text);
    this.doc.text(text, align === 'left' ? x : x - w, y, { lineBreak: false });
  }
}

/** Sum of block heights when stacked. */
export function stackHeight(blocks: LaidBlock[]): number {
  return blocks.reduce((h, b) => h + b.height, 0);
}

export function drawStack(flow: Flow, blocks: LaidBlock[], x: number, y: number, width: number): void {
  let cy = y;
  for (const b of blocks) cy += flow.drawBlock(b, x, cy, width);
}
