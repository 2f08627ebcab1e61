import { z } from 'zod';
import { checkVin } from '../../engine/vin';
import { IsoTime, optionalText, Paging, text, TroubleCodes } from '../../common/validation/domain-schemas';

const STATUSES = ['open', 'diagnosing', 'repaired', 'verified', 'closed'] as const;
export const StatusEnum = z.enum(STATUSES);

const thisYear = new Date().getUTCFullYear();

export const NewVehicle = z
  .strictObject({
    vin: z.string().max(40, 'a VIN is 17 characters'),
    builtOutsideNorthAmerica: z.boolean().default(false),
    highVoltageSystem: z
      .boolean()
      .default(false)
      .describe('true for a hybrid or electric vehicle: every test then shows the high-voltage caution; on a vehicle already on file, true marks it (never unmarks)'),
    year: z.number().int().min(1981, 'a 17-character VIN means model year 1981 or later').max(thisYear + 2),
    make: text(60),
    model: text(60),
    engine: optionalText(80).default(''),
    odometer: z.number().int().min(0).max(3_000_000),
    odometerUnit: z.enum(['mi', 'km']).default('mi'),
  })
  .transform((v, ctx) => {
    const checked = checkVin(v.vin, { outsideNorthAmerica: v.builtOutsideNorthAmerica });
    if (checked.ok) return { ...v, vin: checked.vin, checkDigit: checked.checkDigit };
    for (const f of checked.findings) ctx.addIssue({ code: 'custom', path: ['vin'], message: f.message });
    return z.NEVER;
  });

export const CreateRepairOrder = z
  .strictObject({
    number: text(32)
      .regex(/^[A-Za-z0-9][A-Za-z0-9-/]*$/, 'letters, digits, "-" and "/" only')
      .transform((n) => n.toUpperCase())
      .optional()
      .describe('the shop’s number, stored upper-case; by default the next RO-nnnnn'),
    vehicleId: z.uuid().optional(),
    vehicle: NewVehicle.optional(),
    complaint: text(4000),
    codes: TroubleCodes.default([]),
    technicianId: z.uuid().optional(),
  })
  .superRefine((v, ctx) => {
    if (!v.vehicle === !v.vehicleId) {
      ctx.addIssue({ code: 'custom', path: ['vehicle'], message: 'give either vehicle (a new vehicle) or vehicleId (one already on file), not both or neither' });
    }
  });
export type CreateRepairOrder = z.output<typeof CreateRepairOrder>;

export const UpdateRepairOrder = z
  .strictObject({
    version: z.number().int().min(1, 'the version you last read'),
    complaint: text(4000).optional(),
    cause: optionalText(4000).optional(),
    correction: optionalText(4000).optional(),
    codes: TroubleCodes.optional(),
    codesAfter: TroubleCodes.optional(),
    technicianId: z.uuid().nullable().optional(),
  })
  .refine((v) => Object.keys(v).length > 1, { message: 'name at least one field to change besides version' });
export type UpdateRepairOrder = z.output<typeof UpdateRepairOrder>;

export const ChangeStatus = z.strictObject({
  to: StatusEnum,
  reason: optionalText(2000).optional(),
  version: z.number().int().min(1).optional(),
});
export type ChangeStatus = z.output<typeof ChangeStatus>;

export const ListRepairOrders = z.strictObject({
  status: z
    .string()
    .transform((s) => s.split(',').filter(Boolean))
    .pipe(z.array(StatusEnum))
    .optional(),
  technicianId: z.uuid().optional(),
  changedSince: IsoTime.optional(),
  q: optionalText(60).optional(),
  ...Paging,
});
export type ListRepairOrders = z.output<typeof ListRepairOrders>;
