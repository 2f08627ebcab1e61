import { z } from 'zod';
import { CavityRoleEnum, CircuitUnderTestKindEnum, lineText } from '../../common/validation/domain-schemas';

const CavityName = z
  .string()
  .trim()
  .min(1)
  .max(8, 'a cavity name of at most 8 characters, e.g. "A" or "3"')
  .regex(/^[A-Za-z0-9]+$/, 'letters and digits only, e.g. "A" or "3"');

export const CreateCircuit = z
  .strictObject({
    kind: CircuitUnderTestKindEnum,
    sensor: lineText(64).describe('SAE J1930 sensor term such as TP, APP, MAP, ECT, IAT, FTP, or free text'),
    label: lineText(80).describe('what the technician calls it, e.g. "TP sensor 2"'),
    treeId: z
      .string()
      .min(1)
      .max(64)
      .optional()
      .describe('fault tree to diagnose with (a shop tree id or a built-in one); by default the built-in tree for the kind'),
    cavities: z
      .record(CavityName, CavityRoleEnum)
      .default({})
      .describe('connector cavity → role, e.g. {"A": "reference", "B": "signal", "C": "ground"}'),
  })
  .superRefine((c, ctx) => {
    const wires = c.kind === 'two_wire_thermistor' ? 2 : 3;
    const names = Object.keys(c.cavities);
    if (names.length > 8) ctx.addIssue({ code: 'custom', path: ['cavities'], message: 'at most 8 cavities' });
    for (const role of ['reference', 'signal', 'ground'] as const) {
      const holders = names.filter((n) => c.cavities[n] === role);
      if (holders.length > 1) {
        ctx.addIssue({ code: 'custom', path: ['cavities', holders[1]], message: `only one cavity can be the ${role} (also ${holders[0]})` });
      }
    }
    if (wires === 2 && names.some((n) => c.cavities[n] === 'reference')) {
      const at = names.find((n) => c.cavities[n] === 'reference')!;
      ctx.addIssue({ code: 'custom', path: ['cavities', at], message: 'a two-wire thermistor has no 5 V reference wire: its signal is fed through the module pull-up' });
    }
  });
export type CreateCircuit = z.output<typeof CreateCircuit>;
