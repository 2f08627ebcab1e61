/**
 * Jumper behaviours keyed by what the jumper carries: a fused lead, a resistor, or a variable voltage source
 * (positive terminal on `from`, negative on `to`, behind a small internal resistance).
 */
import type { Jumper, JumperVia, Location } from '../vocabulary';
import { checkFinite, checkResistance, joinPath, type Finding } from '../calc/findings';
import { pointNode, FUSED_JUMPER_OHMS, JUMPER_SOURCE_OHMS } from './measure';
import { Netlist } from './netlist';

interface JumperBehaviour<V extends JumperVia> {
  validate(via: V, path: string): Finding[];
  attach(netlist: Netlist, from: string, to: string, via: V, index: number): void;
}

export const JUMPER_BEHAVIOURS: { [K in JumperVia['kind']]: JumperBehaviour<Extract<JumperVia, { kind: K }>> } = {
  fused_jumper: {
    validate: () => [],
    attach: (netlist, from, to, _via, i) => netlist.add({ id: `jumper_${i}`, kind: 'resistor', nodes: [from, to], value: FUSED_JUMPER_OHMS }),
  },
  resistor: {
    validate: (via, path) => checkResistance(via.ohms, joinPath(path, 'ohms'), 'Jumper resistor', true),
    attach: (netlist, from, to, via, i) => netlist.add({ id: `jumper_${i}`, kind: 'resistor', nodes: [from, to], value: via.ohms }),
  },
  voltage_source: {
    validate: (via, path) => checkFinite(via.volts, joinPath(path, 'volts'), 'Jumper source voltage'),
    attach(netlist, from, to, via, i) {
      netlist.add({ id: `jumper_${i}`, kind: 'vsource', nodes: [`jumper_${i}_plus`, to], value: via.volts });
      netlist.add({ id: `jumper_${i}_r`, kind: 'resistor', nodes: [`jumper_${i}_plus`, from], value: JUMPER_SOURCE_OHMS });
    },
  },
};

function behaviourOf(via: JumperVia): JumperBehaviour<JumperVia> | undefined {
  return (JUMPER_BEHAVIOURS as Record<string, JumperBehaviour<JumperVia> | undefined>)[via?.kind];
}

/** Validates what a jumper carries (the kind itself is checked by the request validation). */
export function validateJumperVia(via: JumperVia, path: string): Finding[] {
  return behaviourOf(via)?.validate(via, path) ?? [];
}

/** Adds the request's jumpers, clipped on at `location`. */
export function attachJumpers(netlist: Netlist, jumpers: Jumper[], location: Location): void {
  jumpers.forEach((j, i) => behaviourOf(j.via)!.attach(netlist, pointNode(j.from, location), pointNode(j.to, location), j.via, i));
}
