/**
 * The evidence digest of a seeded demo order, worked out inside the seeding transaction the way the service does
 * (built-in tree, diagnosis as it stood before the repair, proof view), so a seeded approval covers its evidence.
 */
import type { PrismaClient } from '../generated/prisma/client';
import { builtInTreeFor, diagnose } from '../engine/diagnosis';
import { engineReading } from '../modules/diagnosis/diagnosis.service';
import { MeasurementsRepository } from '../modules/measurements/measurements.repository';
import { buildProofView } from '../modules/proofs/proof-view.builder';
import { RepairOrdersRepository } from '../modules/repair-orders/repair-orders.repository';
import { RepairsRepository } from '../modules/repairs/repairs.repository';
import { ReviewsRepository } from '../modules/reviews/reviews.repository';
import { evidenceDigest } from '../proof-render';

type Tx = Parameters<Parameters<PrismaClient['$transaction']>[0]>[0];

export async function demoEvidenceDigest(tx: Tx, shop: { id: string; name: string; address: string }, repairOrderId: string, concludeAt = 0.95): Promise<string> {
  const database = { prisma: tx as unknown as PrismaClient } as never;
  const order = (await new RepairOrdersRepository(database).find({ shopId: shop.id }, repairOrderId, tx))!;
  const readingsRepo = new MeasurementsRepository(database);
  const circuits = [];
  for (const c of order.circuits) {
    const tree = builtInTreeFor(c.kind)!;
    const readings = await readingsRepo.list(repairOrderId, { circuitId: c.id, includeSuperseded: true }, tx);
    const diagnosis = await diagnose(tree, readings.filter((m) => m.phase === 'diagnosis').map(engineReading), [], { concludeAt });
    circuits.push({ id: c.id, label: c.label, kind: c.kind, tree, diagnosis, readings });
  }
  const repairs = await new RepairsRepository(database).listForOrder(repairOrderId, tx);
  const reviews = await new ReviewsRepository(database).listForOrder(repairOrderId, tx);
  return evidenceDigest(buildProofView({ shop: { ...shop, timeZone: 'UTC' }, order, circuits, repairs, reviews }));
}
