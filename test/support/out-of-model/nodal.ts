/**
 * A small DC solver of our own for the out-of-model cases, written apart from src/engine/circuit so the yardstick
 * does not share the engine's model: modified nodal analysis (Kirchhoff's current law at each node, one extra
 * unknown per voltage source), dense Gaussian elimination with partial pivoting. Node "0" is battery negative.
 */

export type Element =
  | { kind: 'R'; name: string; a: string; b: string; ohms: number }
  /** Current `amps` flows from `a` through the source into `b`. */
  | { kind: 'I'; name: string; a: string; b: string; amps: number }
  /** V(a) − V(b) = volts. */
  | { kind: 'V'; name: string; a: string; b: string; volts: number }
  /** V(a) − V(b) = gain · (V(c) − V(d)). */
  | { kind: 'E'; name: string; a: string; b: string; c: string; d: string; gain: number };

export const GROUND = '0';

export interface Solution {
  volts: Map<string, number>;
  /** Current through each voltage source, from its + terminal through the source to − (SPICE's sign). */
  sourceAmps: Map<string, number>;
}

export class Net {
  readonly elements: Element[] = [];

  r(name: string, a: string, b: string, ohms: number): this {
    if (!(ohms > 0)) throw new Error(`resistor ${name}: ${ohms} Ω`);
    this.elements.push({ kind: 'R', name, a, b, ohms });
    return this;
  }
  i(name: string, a: string, b: string, amps: number): this {
    this.elements.push({ kind: 'I', name, a, b, amps });
    return this;
  }
  v(name: string, a: string, b: string, volts: number): this {
    this.elements.push({ kind: 'V', name, a, b, volts });
    return this;
  }
  e(name: string, a: string, b: string, c: string, d: string, gain: number): this {
    this.elements.push({ kind: 'E', name, a, b, c, d, gain });
    return this;
  }
  without(name: string): Net {
    const n = new Net();
    n.elements.push(...this.elements.filter((e) => e.name !== name));
    return n;
  }
  nodes(): string[] {
    const set = new Set<string>();
    for (const e of this.elements) for (const n of e.kind === 'E' ? [e.a, e.b, e.c, e.d] : [e.a, e.b]) if (n !== GROUND) set.add(n);
    return [...set].sort();
  }

  solve(): Solution {
    const nodes = this.nodes();
    const index = new Map(nodes.map((n, k) => [n, k]));
    const sources = this.elements.filter((e) => e.kind === 'V' || e.kind === 'E');
    const size = nodes.length + sources.length;
    const A = Array.from({ length: size }, () => new Float64Array(size));
    const z = new Float64Array(size);
    const at = (n: string) => (n === GROUND ? -1 : index.get(n)!);
    const add = (r: number, c: number, g: number) => r >= 0 && c >= 0 && (A[r]![c]! += g);
    let s = nodes.length;
    for (const el of this.elements) {
      const a = at(el.a);
      const b = at(el.b);
      if (el.kind === 'R') {
        const g = 1 / el.ohms;
        add(a, a, g), add(b, b, g), add(a, b, -g), add(b, a, -g);
      } else if (el.kind === 'I') {
        if (a >= 0) z[a]! -= el.amps;
        if (b >= 0) z[b]! += el.amps;
      } else {
        const k = s++;
        add(a, k, 1), add(b, k, -1), add(k, a, 1), add(k, b, -1);
        if (el.kind === 'V') z[k] = el.volts;
        else add(k, at(el.c), -el.gain), add(k, at(el.d), el.gain);
      }
    }
    const x = gauss(A, z);
    const volts = new Map<string, number>([[GROUND, 0]]);
    nodes.forEach((n, k) => volts.set(n, x[k]!));
    const sourceAmps = new Map<string, number>();
    sources.forEach((el, k) => sourceAmps.set(el.name, x[nodes.length + k]!));
    return { volts, sourceAmps };
  }

  /** The same circuit as a SPICE deck (ngspice batch mode prints every node voltage). */
  toSpice(title: string): string {
    const lines = this.elements.map((el) => {
      const n = (x: string) => (x === GROUND ? '0' : x);
      if (el.kind === 'R') return `R${el.name} ${n(el.a)} ${n(el.b)} ${el.ohms}`;
      if (el.kind === 'I') return `I${el.name} ${n(el.a)} ${n(el.b)} DC ${el.amps}`;
      if (el.kind === 'V') return `V${el.name} ${n(el.a)} ${n(el.b)} DC ${el.volts}`;
      return `E${el.name} ${n(el.a)} ${n(el.b)} ${n(el.c)} ${n(el.d)} ${el.gain}`;
    });
    return [`* ${title}`, ...lines, '.control', 'op', 'set numdgt=15', 'print all', 'quit 0', '.endc', '.end', ''].join('\n');
  }
}

function gauss(A: Float64Array[], z: Float64Array): Float64Array {
  const n = z.length;
  const b = Float64Array.from(z);
  for (let col = 0; col < n; col++) {
    let p = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(A[r]![col]!) > Math.abs(A[p]![col]!)) p = r;
    if (Math.abs(A[p]![col]!) < 1e-300) throw new Error('singular circuit: a node has no DC path');
    [A[col], A[p]] = [A[p]!, A[col]!];
    [b[col], b[p]] = [b[p]!, b[col]!];
    const pivot = A[col]!;
    for (let r = col + 1; r < n; r++) {
      const row = A[r]!;
      const f = row[col]! / pivot[col]!;
      if (f === 0) continue;
      for (let c = col; c < n; c++) row[c]! -= f * pivot[c]!;
      b[r]! -= f * b[col]!;
    }
  }
  const x = new Float64Array(n);
  for (let r = n - 1; r >= 0; r--) {
    let sum = b[r]!;
    for (let c = r + 1; c < n; c++) sum -= A[r]![c]! * x[c]!;
    x[r] = sum / A[r]![r]!;
  }
  return x;
}
