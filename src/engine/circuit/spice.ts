/**
 * SPICE export of a netlist, the very element list the solver stamps. With `printNodeVoltages` the deck runs an
 * operating point and prints every node voltage to 15 digits (ngspice batch mode: `ngspice -b deck.cir`).
 */
import { Netlist } from './netlist';

export interface SpiceOptions {
  title?: string;
  printNodeVoltages?: boolean;
}

export function toSpice(netlist: Netlist, options: SpiceOptions = {}): string {
  const analysis = options.printNodeVoltages ? ['.control', 'op', 'set numdgt=15', 'print all', 'quit 0', '.endc'] : ['.op'];
  return [`* ${options.title ?? 'Tracebay sensor circuit'}`, ...netlist.spiceLines(), ...analysis, '.end', ''].join('\n');
}

/** Node voltages from ngspice's `print all` output (`name = value` lines; branch currents skipped). */
export function parseSpiceNodeVoltages(output: string): Map<string, number> {
  const out = new Map<string, number>();
  for (const line of output.split('\n')) {
    const m = /^\s*([A-Za-z0-9_]+)\s*=\s*([-+0-9.eE]+)\s*$/.exec(line);
    if (m && !m[1]!.includes('#')) out.set(m[1]!.toLowerCase(), Number(m[2]));
  }
  return out;
}
