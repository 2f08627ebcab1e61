/**
 * Seeds the invented demo shop into an empty database, once. Readings go in exactly as a technician would
 * enter them: units parsed and converted by the same engine code the API uses.
 */
import type { PrismaClient } from '../generated/prisma/client';
import { checkReading } from '../engine/units';
import { withCheckDigit } from '../engine/vin';
import { DEMO_ORDERS, DEMO_SHOP, DEMO_USERS, DEMO_VEHICLES, FOREMAN } from './scenario';

const DAY = 86_400_000;
const MINUTE = 60_000;

export async function seedDemo(prisma: PrismaClient, now = new Date()): Promise<'seeded' | 'already_present'> {
  if ((await prisma.shop.count()) > 0) return 'already_present';
  await prisma.$transaction(async (tx) => {
    await tx.shop.create({ data: DEMO_SHOP });
    for (const u of DEMO_USERS) await tx.user.create({ data: { ...u, shopId: DEMO_SHOP.id } });
    const vehicleIds = new Map<string, string>();
    for (const v of DEMO_VEHICLES) {
      const vin = withCheckDigit(v.vin.replace('?', '0'));
      if (!vin.ok) throw new Error(`demo VIN ${v.vin}: ${vin.findings[0].message}`);
      const { key, ...rest } = v;
      const created = await tx.vehicle.create({ data: { ...rest, vin: vin.vin, shopId: DEMO_SHOP.id, createdById: FOREMAN } });
      vehicleIds.set(key, created.id);
    }
    for (const order of DEMO_ORDERS) {
      const opened = new Date(now.getTime() - order.openedDaysAgo * DAY - 3 * 60 * MINUTE);
      const ro = await tx.repairOrder.create({
        data: {
          shopId: DEMO_SHOP.id,
          number: order.number,
          vehicleId: vehicleIds.get(order.vehicle)!,
          technicianId: order.technician,
          status: order.path[order.path.length - 1],
          complaint: order.complaint,
          cause: order.cause ?? '',
          correction: order.correction ?? '',
          codes: order.codes,
          codesAfter: order.codesAfter ?? [],
          version: order.path.length,
          createdById: FOREMAN,
          createdAt: opened,
          updatedAt: opened,
        },
      });
      const circuit = order.circuit
        ? await tx.circuit.create({ data: { ...order.circuit, repairOrderId: ro.id, createdById: order.technician, createdAt: new Date(opened.getTime() + 5 * MINUTE) } })
        : undefined;
      const ids: string[] = [];
      for (const r of order.readings ?? []) {
        const checked = checkReading(r.value, r.unit, r.request.quantity);
        if (!checked.ok) throw new Error(`demo reading ${order.number}: ${checked.findings[0].message}`);
        const row = await tx.measurement.create({
          data: {
            repairOrderId: ro.id,
            circuitId: circuit!.id,
            quantity: r.request.quantity,
            at: r.request.at,
            against: r.request.against ?? null,
            location: r.request.location,
            connector: r.request.connector,
            key: r.request.key,
            engine: r.request.engine,
            jumpers: r.request.jumpers as object[],
            valueEntered: r.value,
            unitEntered: checked.unit,
            valueSi: checked.siValue,
            siUnit: checked.siUnit,
            phase: r.phase ?? 'diagnosis',
            note: r.note ?? '',
            supersedesId: r.corrects === undefined ? null : ids[r.corrects],
            takenById: order.technician,
            takenAt: new Date(opened.getTime() + r.minute * MINUTE),
          },
        });
        ids.push(row.id);
      }
      // Status history: each step an hour apart, the first by the foreman who opened it.
      let from: (typeof order.path)[number] | null = null;
      for (const [i, to] of order.path.entries()) {
        const at = new Date(opened.getTime() + i * 60 * MINUTE + (i > 0 ? 40 * MINUTE : 0));
        await tx.statusChange.create({ data: { repairOrderId: ro.id, fromStatus: from, toStatus: to, byId: i === 0 ? FOREMAN : order.technician, at } });
        from = to;
      }
      await tx.repairOrder.update({ where: { id: ro.id }, data: { updatedAt: new Date(opened.getTime() + order.path.length * 60 * MINUTE) } });
    }
  });
  return 'seeded';
}
