/**
 * The netlist: named nodes joined by resistors, voltage sources and voltage-controlled voltage sources. Each
 * element kind stamps itself into the modified-nodal-analysis matrix and writes its own SPICE line, so the solver
 * and the SPICE export read one and the same list.
 */
import { DenseLu } from './solver';

/** Battery negative: the reference node (SPICE node 0). */
export const GROUND_NODE = 'bn';

/** Every node also has this resistance to ground so no node floats (SPICE sees the same resistors). */
export const LEAK_OHMS = 1e12;

export type ElementKind = 'resistor' | 'vsource' | 'vcvs' | 'isource';

/**
 * `resistor` nodes [a, b], value Ω. `vsource` nodes [plus, minus], value V. `vcvs` nodes [plus, minus,
 * controlPlus, controlMinus], value = gain. `param` binds the value to a sampled parameter: value = param × scale.
 */
export interface Element {
  id: string;
  kind: ElementKind;
  nodes: string[];
  value: number;
  param?: { key: string; scale: number };
}

interface ElementBehaviour {
  /** Extra unknowns (branch currents) the element adds. */
  branches: number;
  /** Stamps into the n×n matrix `a` and right-hand side `b`; `idx` are node indices (−1 = ground). */
  stamp(a: Float64Array, b: Float64Array, n: number, idx: Int32Array, value: number, branch: number): void;
  spicePrefix: string;
  spiceValue(value: number, nodes: string[]): string;
}

function add(a: Float64Array, n: number, i: number, j: number, v: number): void {
  if (i >= 0 && j >= 0) a[i * n + j] = a[i * n + j]! + v;
}

const ELEMENT_BEHAVIOURS: Record<ElementKind, ElementBehaviour> = {
  resistor: {
    branches: 0,
    stamp(a, _b, n, idx, ohms) {
      const g = 1 / ohms;
      const p = idx[0]!;
      const q = idx[1]!;
      add(a, n, p, p, g);
      add(a, n, q, q, g);
      add(a, n, p, q, -g);
      add(a, n, q, p, -g);
    },
    spicePrefix: 'R',
    spiceValue: (v) => fmt(v),
  },
  vsource: {
    branches: 1,
    stamp(a, b, n, idx, volts, k) {
      const p = idx[0]!;
      const q = idx[1]!;
      add(a, n, p, k, 1);
      add(a, n, q, k, -1);
      add(a, n, k, p, 1);
      add(a, n, k, q, -1);
      b[k] = b[k]! + volts;
    },
    spicePrefix: 'V',
    spiceValue: (v) => `DC ${fmt(v)}`,
  },
  // Current `value` A flows from nodes[0] through the source into nodes[1] (SPICE's I element).
  isource: {
    branches: 0,
    stamp(_a, b, _n, idx, amps) {
      const p = idx[0]!;
      const q = idx[1]!;
      if (p >= 0) b[p] = b[p]! - amps;
      if (q >= 0) b[q] = b[q]! + amps;
    },
    spicePrefix: 'I',
    spiceValue: (v) => `DC ${fmt(v)}`,
  },
  vcvs: {
    branches: 1,
    stamp(a, _b, n, idx, gain, k) {
      const p = idx[0]!;
      const q = idx[1]!;
      add(a, n, p, k, 1);
      add(a, n, q, k, -1);
      add(a, n, k, p, 1);
      add(a, n, k, q, -1);
      add(a, n, k, idx[2]!, -gain);
      add(a, n, k, idx[3]!, gain);
    },
    spicePrefix: 'E',
    spiceValue: (v, nodes) => `${nodes[2]} ${nodes[3]} ${fmt(v)}`,
  },
};

export function fmt(v: number): string {
  return v.toPrecision(17).replace(/\.?0+(e|$)/, '$1');
}

/** A mutable element list keyed by id; faults, connectors, jumpers and the meter edit it before it is solved. */
export class Netlist {
  private readonly byId = new Map<string, Element>();

  add(element: Element): void {
    if (this.byId.has(element.id)) throw new Error(`duplicate element id ${element.id}`);
    this.byId.set(element.id, element);
  }

  remove(id: string): boolean {
    return this.byId.delete(id);
  }

  get(id: string): Element | undefined {
    return this.byId.get(id);
  }

  has(id: string): boolean {
    return this.byId.has(id);
  }

  /** A fresh id with the given stem. */
  uniqueId(stem: string): string {
    if (!this.byId.has(stem)) return stem;
    for (let k = 2; ; k++) if (!this.byId.has(`${stem}_${k}`)) return `${stem}_${k}`;
  }

  elements(): Element[] {
    return [...this.byId.values()];
  }

  /** Non-ground nodes in first-use order. */
  nodes(): string[] {
    const seen = new Set<string>();
    for (const e of this.byId.values()) for (const node of e.nodes) if (node !== GROUND_NODE) seen.add(node);
    return [...seen];
  }

  /**
   * Adds the leak resistor of every node (idempotent), and of `alsoNodes`: a probe may touch a terminal that
   * nothing else connects to any more (the harness side of an unplugged connector behind an open wire).
   * Call once the netlist is complete.
   */
  addLeaks(alsoNodes: readonly string[] = []): void {
    for (const node of new Set([...this.nodes(), ...alsoNodes.filter((n) => n !== GROUND_NODE)])) {
      const id = `leak_${node}`;
      if (!this.byId.has(id)) this.add({ id, kind: 'resistor', nodes: [node, GROUND_NODE], value: LEAK_OHMS });
    }
  }

  /** Nominal parameter values (value / scale of every bound element). */
  params(): Record<string, number> {
    const out: Record<string, number> = {};
    for (const e of this.byId.values()) if (e.param) out[e.param.key] = e.value / e.param.scale;
    return out;
  }

  /** SPICE element lines (ground written as node 0). */
  spiceLines(): string[] {
    const node = (name: string) => (name === GROUND_NODE ? '0' : name);
    return this.elements().map((e) => {
      const behaviour = ELEMENT_BEHAVIOURS[e.kind];
      const nodes = e.nodes.map(node);
      return `${behaviour.spicePrefix}${e.id} ${nodes[0]} ${nodes[1]} ${behaviour.spiceValue(e.value, nodes)}`;
    });
  }

  compile(): CompiledNetlist {
    return new CompiledNetlist(this.elements());
  }
}

/**
 * A netlist frozen into index form. `solve(params)` restamps with parameter overrides and factors; the returned
 * solution holds node voltages by index. Reuses its buffers, so a Monte Carlo run allocates nothing per sample.
 */
export class CompiledNetlist {
  readonly size: number;
  readonly nodeIndex = new Map<string, number>();
  readonly paramKeys: string[] = [];
  private readonly kinds: ElementBehaviour[] = [];
  private readonly idx: Int32Array[] = [];
  private readonly values: Float64Array;
  private readonly scales: Float64Array;
  private readonly paramSlot: Int32Array;
  private readonly branch: Int32Array;
  private readonly lu: DenseLu;
  private readonly rhs: Float64Array;

  constructor(elements: Element[]) {
    for (const e of elements) {
      for (const node of e.nodes) {
        if (node !== GROUND_NODE && !this.nodeIndex.has(node)) this.nodeIndex.set(node, this.nodeIndex.size);
      }
    }
    const nodeCount = this.nodeIndex.size;
    let extra = nodeCount;
    this.values = new Float64Array(elements.length);
    this.scales = new Float64Array(elements.length);
    this.paramSlot = new Int32Array(elements.length);
    this.branch = new Int32Array(elements.length);
    elements.forEach((e, i) => {
      const behaviour = ELEMENT_BEHAVIOURS[e.kind];
      this.kinds.push(behaviour);
      this.idx.push(Int32Array.from(e.nodes, (node) => (node === GROUND_NODE ? -1 : this.nodeIndex.get(node)!)));
      this.values[i] = e.value;
      this.branch[i] = behaviour.branches ? extra : -1;
      extra += behaviour.branches;
      if (e.param) {
        let slot = this.paramKeys.indexOf(e.param.key);
        if (slot < 0) slot = this.paramKeys.push(e.param.key) - 1;
        this.paramSlot[i] = slot;
        this.scales[i] = e.param.scale;
      } else {
        this.paramSlot[i] = -1;
      }
    });
    this.size = extra;
    this.lu = new DenseLu(extra);
    this.rhs = new Float64Array(extra);
  }

  /** Node index, or −1 for ground; undefined for an unknown node. */
  index(node: string): number | undefined {
    return node === GROUND_NODE ? -1 : this.nodeIndex.get(node);
  }

  /**
   * Stamps and factors. `params` (aligned with `paramKeys`) overrides bound element values; NaN keeps nominal.
   * Returns false for a singular system.
   */
  factor(params?: Float64Array): boolean {
    const { lu, rhs, size } = this;
    lu.a.fill(0);
    rhs.fill(0);
    for (let i = 0; i < this.kinds.length; i++) {
      const slot = this.paramSlot[i]!;
      let value = this.values[i]!;
      if (params && slot >= 0) {
        const p = params[slot]!;
        if (!Number.isNaN(p)) value = p * this.scales[i]!;
      }
      this.kinds[i]!.stamp(lu.a, rhs, size, this.idx[i]!, value, this.branch[i]!);
    }
    return lu.factor();
  }

  /** Solution for the sources' right-hand side after `factor`; `out` receives the unknowns. */
  solveSources(out: Float64Array): void {
    out.set(this.rhs);
    this.lu.solve(out);
  }

  /** Solution for a unit current injected into `into` and drawn from `outOf` (sources off), after `factor`. */
  solveInjection(into: number, outOf: number, amps: number, out: Float64Array): void {
    out.fill(0);
    if (into >= 0) out[into] = amps;
    if (outOf >= 0) out[outOf] = -amps;
    this.lu.solve(out);
  }
}

/** Every node voltage of a netlist at nominal values (ground included as 0), or undefined if singular. */
export function solveNodeVoltages(netlist: Netlist): Map<string, number> | undefined {
  const compiled = netlist.compile();
  if (!compiled.factor()) return undefined;
  const x = new Float64Array(compiled.size);
  compiled.solveSources(x);
  const out = new Map<string, number>([[GROUND_NODE, 0]]);
  for (const [node, i] of compiled.nodeIndex) out.set(node, x[i]!);
  return out;
}
