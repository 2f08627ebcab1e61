import { z } from 'zod';
import { LIMITS } from '../../common/limits';
import { checkVin } from '../../engine/vin';
import { TypedOrderNumber } from '../order-numbering/order-numbering.dto';
import { IsoTime, lineText, optionalLineText, optionalText, Paging, text, TroubleCodes } from '../../common/validation/domain-schemas';
import { typedInteger } from '../../common/validation/typed-number';

const T = LIMITS.text;

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
    year: typedInteger(1981, thisYear + 2, '2019'),
    make: lineText(T.vehicleMake),
    model: lineText(T.vehicleModel),
    engine: optionalLineText(T.vehicleEngine).default(''),
    odometer: typedInteger(0, LIMITS.number.odometer, '148,220'),
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
    number: TypedOrderNumber.optional().describe('the shop’s number, stored upper-case; by default the next automatic one (see /api/shop/order-numbering)'),
    vehicleId: z.uuid().optional(),
    vehicle: NewVehicle.optional(),
    complaint: text(T.complaint),
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
    complaint: text(T.complaint).optional(),
    cause: optionalText(T.cause).optional(),
    correction: optionalText(T.correction).optional(),
    odometerOut: z.number().int().min(0).max(LIMITS.number.odometer).nullable().optional().describe('odometer when the vehicle leaves, for the proof'),
    codes: TroubleCodes.optional(),
    codesAfter: TroubleCodes.optional(),
    technicianId: z.uuid().nullable().optional(),
  })
  .refine((v) => Object.keys(v).length > 1, { message: 'name at least one field to change besides version' });
export type UpdateRepairOrder = z.output<typeof UpdateRepairOrder>;

export const ChangeStatus = z.strictObject({
  to: StatusEnum,
  reason: optionalText(T.statusReason).optional(),
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
  q: optionalLineText(60).optional(),
  ...Paging,
});
export type ListRepairOrders = z.output<typeof ListRepairOrders>;
