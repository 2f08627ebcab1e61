import { Injectable } from '@nestjs/common';
import type { Db } from '../../common/database/database.tokens';
import { PrismaRepository, writeStamp } from '../../common/database/prisma-repository';
import type { Prisma } from '../../generated/prisma/client';

export const measurementInclude = {
  takenBy: { select: { id: true, name: true } },
  supersededBy: { select: { id: true, takenAt: true, takenBy: { select: { id: true, name: true } } } },
} satisfies Prisma.MeasurementInclude;

export type MeasurementRow = Prisma.MeasurementGetPayload<{ include: typeof measurementInclude }>;

/** A reading as it is stored, before the database gives it its id and entry number. */
export type NewReading = Omit<MeasurementRow, 'id' | 'seq' | 'takenBy' | 'supersededBy' | 'jumpers'> & { jumpers: unknown };

@Injectable()
export class MeasurementsRepository extends PrismaRepository {
  /** The rows a batch wants to correct, with whether each is already corrected. */
  correctionTargets(repairOrderId: string, ids: string[], db: Db) {
    return db.measurement.findMany({
      where: { repairOrderId, id: { in: ids } },
      select: {
        id: true,
        circuitId: true,
        phase: true,
        quantity: true,
        at: true,
        against: true,
        location: true,
        connector: true,
        againstLocation: true,
        otherConnector: true,
        key: true,
        engine: true,
        sensorInput: true,
        pid: true,
        sensor: true,
        jumpers: true,
        supersededBy: { select: { id: true } },
      },
    });
  }

  byClientKeys(repairOrderId: string, keys: string[], db: Db = this.prisma): Promise<MeasurementRow[]> {
    if (keys.length === 0) return Promise.resolve([]);
    return db.measurement.findMany({ where: { repairOrderId, clientKey: { in: keys } }, include: measurementInclude });
  }

  /**
   * One by one inside the caller's transaction: the batch keeps its order and a failure undoes all of it. Each
   * insert returns its row; who took it is the caller, and a new reading is corrected by nobody yet.
   */
  async insertMany(db: Db, takenBy: { id: string; name: string }, rows: Prisma.MeasurementUncheckedCreateInput[]): Promise<MeasurementRow[]> {
    const created: MeasurementRow[] = [];
    for (const data of rows) created.push({ ...(await db.measurement.create({ data })), takenBy, supersededBy: null });
    return created;
  }

  /** Whether `ReadingRepository.store` can serve this request (see there), known before anything is read. */
  canInsertAlone(): boolean {
    const stamp = writeStamp();
    return stamp !== undefined && !stamp.idempotencyId;
  }

  list(repairOrderId: string, filter: { circuitId?: string; phase?: 'diagnosis' | 'verification'; includeSuperseded: boolean }, db: Db = this.prisma) {
    return db.measurement.findMany({
      where: {
        repairOrderId,
        ...(filter.circuitId ? { circuitId: filter.circuitId } : {}),
        ...(filter.phase ? { phase: filter.phase } : {}),
        ...(filter.includeSuperseded ? {} : { supersededBy: { is: null } }),
      },
      include: measurementInclude,
      orderBy: [{ takenAt: 'asc' }, { seq: 'asc' }],
    });
  }
}
