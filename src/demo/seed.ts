/**
 * Seeds the invented demo shop into an empty database, once. Readings go in exactly as a technician would
 * enter them (units parsed by the same engine code as the API), and each job's readings are the ones the
 * fault-tree engine asks for, answered by the circuit model for that job's invented fault.
 */
import type { Prisma, PrismaClient } from '../generated/prisma/client';
import { builtInTreeFor } from '../engine/diagnosis';
import { checkReading } from '../engine/units';
import { withCheckDigit } from '../engine/vin';
import { hashPassword } from '../modules/auth/secrets';
import { DEMO_ORDERS, DEMO_ORDERS_TWO, DEMO_SHOP, DEMO_SHOP_TWO, DEMO_USERS, DEMO_USERS_TWO, DEMO_VEHICLES, DEMO_VEHICLES_TWO, FOREMAN, FOREMAN_TWO, type DemoOrder } from './scenario';
import { diagnosisReadings, meterShows, type SimulatedReading } from './simulate-readings';
import { demoEvidenceDigest } from './evidence-digest';

const DAY = 86_400_000;
const MINUTE = 60_000;
interface DemoShopPlan {
  shop: { id: string; name: string; address: string };
  users: ReadonlyArray<{ id: string; name: string; email: string; role: 'technician' | 'foreman' | 'admin'; password: string }>;
  vehicles: ReadonlyArray<{ key: string; vin: string; year: number; make: string; model: string; engine: string; odometer: number }>;
  orders: DemoOrder[];
  foreman: string;
}

const SHOPS: DemoShopPlan[] = [
  { shop: DEMO_SHOP, users: DEMO_USERS, vehicles: DEMO_VEHICLES, orders: DEMO_ORDERS, foreman: FOREMAN },
  { shop: DEMO_SHOP_TWO, users: DEMO_USERS_TWO, vehicles: DEMO_VEHICLES_TWO, orders: DEMO_ORDERS_TWO, foreman: FOREMAN_TWO },
];

/** Every demo person with the password printed at start-up. */
export const DEMO_SIGN_INS = SHOPS.flatMap((p) => p.users.map((u) => ({ shop: p.shop.name, ...u })));

export async function seedDemo(prisma: PrismaClient, now = new Date()): Promise<'seeded' | 'already_present'> {
  if ((await prisma.shop.count()) > 0) return 'already_present';
  const plans = await Promise.all(
    SHOPS.map(async (p) => ({
      ...p,
      hashes: new Map(await Promise.all(p.users.map(async (u) => [u.id, await hashPassword(u.password)] as const))),
      jobs: await Promise.all(p.orders.map(async (order) => ({ order, readings: order.circuit ? await diagnosisReadings(order.circuit.kind, order.circuit.fault, order.circuit.stopAfter) : [] }))),
    })),
  );
  await prisma.$transaction(async (tx) => {
    for (const plan of plans) {
      await tx.shop.create({ data: plan.shop });
      for (const { password: _, ...u } of plan.users) await tx.user.create({ data: { ...u, shopId: plan.shop.id, passwordHash: plan.hashes.get(u.id)! } });
      const vehicleIds = new Map<string, string>();
      for (const v of plan.vehicles) {
        const vin = withCheckDigit(v.vin.replace('?', '0'));
        if (!vin.ok) throw new Error(`demo VIN ${v.vin}: ${vin.findings[0]!.message}`);
        const { key, ...rest } = v;
        vehicleIds.set(key, (await tx.vehicle.create({ data: { ...rest, vin: vin.vin, shopId: plan.shop.id, createdById: plan.foreman } })).id);
      }
      const shop = { shopId: plan.shop.id, foreman: plan.foreman, shop: plan.shop };
      for (const { order, readings } of plan.jobs) await seedOrder(tx, shop, order, readings, vehicleIds.get(order.vehicle)!, now);
      await tx.orderNumbering.create({ data: { shopId: plan.shop.id, ...demoNumbering(plan.orders) } });
    }
  });
  return 'seeded';
}

/** New orders continue the demo's own numbers: its prefix and width, after its highest number. */
export function demoNumbering(orders: ReadonlyArray<{ number: string }>): { prefix: string; width: number; next: bigint } {
  const parts = orders.map((o) => /^(.*?)(\d+)$/.exec(o.number)!);
  const highest = parts.reduce((a, b) => (Number(b[2]) > Number(a[2]) ? b : a));
  return { prefix: highest[1]!, width: highest[2]!.length, next: BigInt(Number(highest[2]) + 1) };
}

async function seedOrder(tx: Prisma.TransactionClient, shop: { shopId: string; foreman: string; shop: { id: string; name: string; address: string } }, order: DemoOrder, readings: SimulatedReading[], vehicleId: string, now: Date): Promise<void> {
  let clock = now.getTime() - order.openedDaysAgo * DAY - 5 * 60 * MINUTE;
  const tick = (minutes: number) => new Date((clock += minutes * MINUTE));
  const opened = tick(0);
  const ro = await tx.repairOrder.create({
    data: {
      shopId: shop.shopId,
      number: order.number,
      vehicleId,
      technicianId: order.technician,
      status: order.path.at(-1)!,
      complaint: order.complaint,
      cause: order.cause ?? '',
      correction: order.correction ?? '',
      codes: order.codes,
      codesAfter: order.codesAfter ?? [],
      version: order.path.length,
      createdById: shop.foreman,
      createdAt: opened,
      updatedAt: opened,
    },
  });
  const status = async (from: string | null, to: string, at: Date, byId: string, reason = '') =>
    tx.statusChange.create({ data: { repairOrderId: ro.id, fromStatus: from as never, toStatus: to as never, byId, at, reason } });
  await status(null, 'open', opened, shop.foreman);
  if (!order.circuit) return;

  const c = order.circuit;
  const tree = builtInTreeFor(c.kind)!;
  const faultTree =
    (await tx.faultTree.findFirst({ where: { shopId: null, treeId: tree.id, version: tree.version } })) ??
    (await tx.faultTree.create({ data: { shopId: null, treeId: tree.id, version: tree.version, circuitKind: c.kind, label: tree.title, document: tree.document as object } }));
  const circuit = await tx.circuit.create({
    data: { repairOrderId: ro.id, kind: c.kind, sensor: c.sensor, label: c.label, cavities: c.cavities, faultTreeId: faultTree.id, createdById: order.technician, createdAt: tick(6) },
  });
  const insert = async (r: SimulatedReading, phase: 'diagnosis' | 'verification', extra: { supersedesId?: string; note?: string } = {}) => {
    const typed = r.value === 'OL' ? 0 : r.value;
    const checked = checkReading(typed, r.unit, r.request.quantity);
    if (!checked.ok) throw new Error(`demo reading ${order.number}: ${checked.findings[0]!.message}`);
    const overload = r.value === 'OL';
    return tx.measurement.create({
      data: {
        repairOrderId: ro.id,
        circuitId: circuit.id,
        ...r.request,
        against: r.request.against ?? null,
        jumpers: r.request.jumpers as object[],
        valueEntered: overload ? null : checked.value,
        unitEntered: checked.unit,
        valueSi: overload ? null : checked.siValue,
        siUnit: checked.siUnit,
        overload,
        phase,
        note: extra.note ?? '',
        supersedesId: extra.supersedesId ?? null,
        takenById: order.technician,
        takenAt: tick(3),
      },
    });
  };
  for (const [i, r] of readings.entries()) {
    if (i === 0) await status('open', 'diagnosing', new Date(clock + 3 * MINUTE), order.technician, 'first reading recorded');
    if (i === c.typoAt && typeof r.value === 'number') {
      const wrong = await insert({ ...r, value: Number((r.value * 10).toFixed(2)) }, 'diagnosis');
      await insert(r, 'diagnosis', { supersedesId: wrong.id, note: 'Decimal point slipped on the first entry.' });
    } else {
      await insert(r, 'diagnosis');
    }
  }
  if (!order.repair || !order.path.includes('repaired')) return;
  const repairedAt = tick(35);
  await tx.repair.create({ data: { repairOrderId: ro.id, circuitId: circuit.id, ...order.repair, byId: order.technician, at: repairedAt } });
  await status('diagnosing', 'repaired', repairedAt, order.technician, 'repair recorded');
  if (!order.path.includes('verified')) return;
  // After the repair, the first tests again: the circuit now reads as a healthy one.
  for (const r of readings.slice(0, 4)) await insert(meterShows(c.kind, 'good', r.request), 'verification');
  // Codes cleared and read again after three key cycles (none returned), and the odometer as the vehicle left.
  const { odometer } = await tx.vehicle.findUniqueOrThrow({ where: { id: vehicleId }, select: { odometer: true } });
  await tx.repairOrder.update({
    where: { id: ro.id },
    data: { codesAfterMethod: 'cleared_then_key_cycles', codesAfterKeyCycles: 3, codesAfterCheckedAt: tick(6), odometerOut: odometer + 2 },
  });
  await status('repaired', 'verified', tick(4), order.technician);
  for (const [position, review] of (order.reviews ?? []).entries()) {
    // Decided on the evidence as it stands, as the service records a decision.
    const evidenceDigest = await demoEvidenceDigest(tx, shop.shop, ro.id);
    await tx.review.create({ data: { repairOrderId: ro.id, decision: review.decision, comment: review.comment, byId: shop.foreman, at: tick(50), position: position + 1, evidenceDigest } });
  }
  if (order.path.includes('closed')) await status('verified', 'closed', tick(24 * 60), shop.foreman);
  await tx.repairOrder.update({ where: { id: ro.id }, data: { updatedAt: new Date(clock) } });
}
