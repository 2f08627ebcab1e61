/**
 * Compiled fault trees kept in memory, least recently used first out: bounded by count and by approximate size,
 * and emptied of trees nobody has used for a while, so memory comes back when the shop is idle. A tree that is not
 * here is compiled again from its stored document (stored versions never change).
 */
import type { Tree } from '../../engine/diagnosis';

/** A compiled tree takes about this many bytes of heap per character of its JSON document (measured: about 5.4). */
const BYTES_PER_DOCUMENT_CHAR = 6;
/** Trees unused this long are dropped by the idle sweep. */
export const TREE_CACHE_IDLE_MS = 10 * 60_000;

interface Entry {
  tree: Tree;
  bytes: number;
  usedAt: number;
}

export function approximateTreeBytes(tree: Tree): number {
  return JSON.stringify(tree.document).length * BYTES_PER_DOCUMENT_CHAR;
}

export class TreeCache {
  /** Map order is use order: the first entry is the least recently used. */
  private readonly entries = new Map<string, Entry>();
  private bytes = 0;

  constructor(
    readonly maxTrees: number,
    readonly maxBytes: number,
    private readonly now: () => number = Date.now,
  ) {}

  get(version: string): Tree | undefined {
    const entry = this.entries.get(version);
    if (!entry) return undefined;
    this.entries.delete(version);
    entry.usedAt = this.now();
    this.entries.set(version, entry);
    return entry.tree;
  }

  set(version: string, tree: Tree): void {
    this.drop(version);
    const entry = { tree, bytes: approximateTreeBytes(tree), usedAt: this.now() };
    this.entries.set(version, entry);
    this.bytes += entry.bytes;
    // The newest tree stays even alone over the size bound: it is about to be used.
    for (const [oldest] of this.entries) {
      if (this.entries.size <= 1 || (this.entries.size <= this.maxTrees && this.bytes <= this.maxBytes)) break;
      this.drop(oldest);
    }
  }

  /** Drops every tree unused for `idleMs`. */
  sweep(idleMs = TREE_CACHE_IDLE_MS): void {
    const before = this.now() - idleMs;
    for (const [version, entry] of this.entries) if (entry.usedAt <= before) this.drop(version);
  }

  stats(): { trees: number; bytes: number; maxTrees: number; maxBytes: number } {
    return { trees: this.entries.size, bytes: this.bytes, maxTrees: this.maxTrees, maxBytes: this.maxBytes };
  }

  private drop(version: string): void {
    const entry = this.entries.get(version);
    if (!entry) return;
    this.entries.delete(version);
    this.bytes -= entry.bytes;
  }
}
