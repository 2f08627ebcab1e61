import { Inject, Injectable, type OnModuleDestroy } from '@nestjs/common';
import { APP_CONFIG, type AppConfig } from '../../config/config';
import { ConflictException, DomainException, InvalidInputException, NotFoundException, type Finding } from '../../common/errors/domain.exception';
import type { Db } from '../../common/database/database.tokens';
import { builtInTreeFor, builtInTrees, loadTree, type Tree } from '../../engine/diagnosis';
import type { CircuitKind } from '../../generated/prisma/client';
import type { Actor } from '../identity/actor';
import { FaultTreesRepository } from './fault-trees.repository';
import { TreeCache } from './tree-cache';

/** Row ids remembered with their shop and version (a few dozen bytes each), most recent last. */
const MAX_ROWS_REMEMBERED = 10_000;
const SWEEP_EVERY_MS = 60_000;

function treeFindings(findings: ReadonlyArray<{ code: string; path: string; message: string; severity?: string }>, root: string): Finding[] {
  return findings
    .filter((f) => (f.severity ?? 'error') === 'error')
    // Same path style as every other 400: dotted, list positions as numbers ("body.tests.0.outcomes.1").
    .map((f) => ({ code: f.code, path: [root, f.path.replace(/\[(\d+)\]/g, '.$1').replace(/^\$?\.?/, '')].filter(Boolean).join('.'), message: f.message }));
}

/**
 * Every fault tree a circuit can be diagnosed with: the built-in ones and each shop's uploads, by stored version.
 * Built-in trees stay loaded; shop trees are compiled on demand into a bounded cache (see tree-cache.ts).
 */
@Injectable()
export class FaultTreeCatalog implements OnModuleDestroy {
  private readonly builtInByVersion = new Map<string, Tree>();
  readonly cache: TreeCache;
  private readonly byRow = new Map<string, { shopId: string | null; version: string }>();
  /** Row id of each built-in tree version once stored (rows of fault trees are never changed or deleted). */
  private readonly builtInRows = new Map<string, string>();
  private readonly sweeper: NodeJS.Timeout;

  constructor(
    private readonly trees: FaultTreesRepository,
    @Inject(APP_CONFIG) config: AppConfig,
  ) {
    for (const tree of Object.values(builtInTrees())) this.builtInByVersion.set(tree.version, tree);
    this.cache = new TreeCache(config.treeCache.maxTrees, config.treeCache.maxBytes);
    this.sweeper = setInterval(() => this.cache.sweep(), SWEEP_EVERY_MS).unref();
  }

  onModuleDestroy(): void {
    clearInterval(this.sweeper);
  }

  /**
   * The stored tree version a new circuit starts with: the named tree (the shop's newest version, or a built-in
   * one), else the built-in tree for the kind. A tree for another kind of circuit is refused.
   */
  async bindForCircuit(actor: Actor, kind: CircuitKind, treeId: string | undefined, db: Db): Promise<{ id: string; tree: Tree }> {
    // Without a tree named, the built-in tree made for the kind.
    const wanted = treeId ?? builtInTreeFor(kind)?.id;
    const own = treeId ? await this.trees.latestForShop(actor.shopId, treeId, db) : null;
    if (own) {
      const stored = (await this.trees.findVisible(actor.shopId, own.id, db))!;
      const tree = this.load(stored.document, stored.version);
      this.requireKind(tree, kind);
      return { id: own.id, tree };
    }
    const builtIn = wanted === undefined ? undefined : builtInTrees()[wanted];
    if (!builtIn) {
      throw new InvalidInputException([{ code: 'fault_tree.not_found', path: 'body.treeId', message: `no fault tree "${wanted}" in this shop or built in` }]);
    }
    this.requireKind(builtIn, kind);
    const key = `${builtIn.id}@${builtIn.version}`;
    const known = this.builtInRows.get(key);
    if (known) return { id: known, tree: builtIn };
    const { row, created } = await this.trees.ensure(db, {
      shopId: null,
      treeId: builtIn.id,
      version: builtIn.version,
      circuitKind: builtIn.circuitKind as CircuitKind,
      label: builtIn.title,
      document: builtIn.document as object,
      createdById: null,
    });
    // Only a row that was there before is known to be committed; one stored just now may still be rolled back.
    if (!created) this.builtInRows.set(key, row.id);
    return { id: row.id, tree: builtIn };
  }

  /** The loaded tree of a stored version. */
  async byStoredId(actor: Actor, id: string, db?: Db): Promise<Tree> {
    // Stored versions never change, so a row read once serves every later diagnosis (its shop still checked).
    const known = this.byRow.get(id);
    if (known && (known.shopId === null || known.shopId === actor.shopId)) {
      const tree = this.builtInByVersion.get(known.version) ?? this.cache.get(known.version);
      if (tree) return tree;
    }
    const stored = await this.trees.findVisible(actor.shopId, id, db);
    if (!stored) throw new NotFoundException('fault_tree', id);
    const tree = this.load(stored.document, stored.version);
    this.byRow.delete(id);
    this.byRow.set(id, { shopId: stored.shopId, version: stored.version });
    if (this.byRow.size > MAX_ROWS_REMEMBERED) this.byRow.delete(this.byRow.keys().next().value!);
    return tree;
  }

  /** Validates and stores a shop's tree; the same document twice is the same version. */
  async upload(actor: Actor, document: unknown, db: Db) {
    if (actor.role === 'technician') {
      throw new DomainException('forbidden', 'fault_tree.foreman_only', 'Only a foreman (or an admin) uploads fault trees.');
    }
    const result = loadTree(document);
    if (!result.ok) throw new InvalidInputException(treeFindings(result.findings, 'body'));
    const tree = result.tree;
    if (builtInTrees()[tree.id]) {
      throw new ConflictException('fault_tree.builtin_id', `"${tree.id}" is the id of a built-in tree; give the shop's tree an id of its own.`, {}, [
        { code: 'fault_tree.builtin_id', path: 'body.id', message: 'taken by a built-in tree' },
      ]);
    }
    const { row, created } = await this.trees.ensure(db, {
      shopId: actor.shopId,
      treeId: tree.id,
      version: tree.version,
      circuitKind: tree.circuitKind as CircuitKind,
      label: tree.title,
      document: tree.document as object,
      createdById: actor.userId,
    });
    this.cache.set(tree.version, tree);
    return { tree: row, created, warnings: result.findings.filter((f) => f.severity !== 'error') };
  }

  builtIns() {
    return Object.values(builtInTrees()).map((t) => ({ treeId: t.id, version: t.version, circuitKind: t.circuitKind, label: t.title, builtIn: true }));
  }

  private load(document: unknown, version: string): Tree {
    const cached = this.builtInByVersion.get(version) ?? this.cache.get(version);
    if (cached) return cached;
    const result = loadTree(document, { stored: true });
    if (!result.ok && result.findings.some((f) => f.code.startsWith('tree.limit.'))) {
      // Stored before the limits existed: refused rather than let one diagnosis hold up the whole service.
      throw new DomainException(
        'unprocessable',
        'fault_tree.over_limits',
        'This circuit’s fault tree is larger than the service diagnoses with; upload a smaller version of it for new circuits. Its readings are kept.',
        treeFindings(result.findings, 'faultTree'),
      );
    }
    // A stored document was valid when stored; failing now means the tree format itself changed.
    if (!result.ok) throw new Error(`stored fault tree ${version} no longer loads: ${result.findings[0]?.message}`);
    this.cache.set(version, result.tree);
    return result.tree;
  }

  private requireKind(tree: Tree, kind: CircuitKind): void {
    if (tree.circuitKind !== kind) {
      throw new InvalidInputException([
        { code: 'fault_tree.wrong_kind', path: 'body.treeId', message: `tree "${tree.id}" is for ${tree.circuitKind} circuits, not ${kind}` },
      ]);
    }
  }
}
