import { Injectable } from '@nestjs/common';
import type { Db } from '../../common/database/database.tokens';
import { randomUUID } from 'node:crypto';
import { PrismaRepository, writeStamp } from '../../common/database/prisma-repository';
import type { Prisma, RepairOrderStatus } from '../../generated/prisma/client';

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

  /** Whether `insertWhileStatus` can serve this request (see there), known before anything is read. */
  canInsertAlone(): boolean {
    const stamp = writeStamp();
    return stamp !== undefined && !stamp.idempotencyId;
  }

  /**
   * One new reading in one statement, stored only while its order still has `status` (the status the caller
   * checked it against): the order is touched and the audit trigger told who writes, as in `transaction()`, all in
   * the statement's own transaction. Null when the order has moved on (nothing stored); undefined when this cannot
   * be used here: outside a request, or with an Idempotency-Key, whose record `transaction()` marks with the write.
   */
  async insertWhileStatus(status: RepairOrderStatus, takenBy: { id: string; name: string }, data: NewReading): Promise<MeasurementRow | null | undefined> {
    const stamp = writeStamp();
    if (!stamp || stamp.idempotencyId) return undefined;
    const id = randomUUID();
    const touchedAt = new Date();
    // The stamp is set before the order is touched and the row inserted (the UPDATE waits on it), and the audit
    // triggers fire at the end of the statement.
    const rows = await this.prisma.$queryRaw<Array<{ seq: number; jumpers: Prisma.JsonValue }>>`
      WITH stamp AS (SELECT set_config('tracebay.context', ${stamp.context}, true) AS c),
      still AS (
        UPDATE "RepairOrder" SET "updatedAt" = ${touchedAt}::timestamptz
        WHERE "id" = ${data.repairOrderId}::uuid AND "status" = ${status}::"RepairOrderStatus" AND EXISTS (SELECT 1 FROM stamp)
        RETURNING "id"
      )
      INSERT INTO "Measurement" ("id", "repairOrderId", "circuitId", "quantity", "at", "against", "location", "connector", "key",
        "engine", "jumpers", "pid", "sensor", "valueEntered", "unitEntered", "valueSi", "overload", "siUnit", "meterOhms", "phase",
        "note", "supersedesId", "clientKey", "takenById", "takenAt", "againstLocation", "otherConnector")
      SELECT ${id}::uuid, still."id", ${data.circuitId}::uuid, ${data.quantity}::"Quantity", ${data.at}::"ProbePoint",
        ${data.against}::"ProbePoint", ${data.location}::"ProbeLocation", ${data.connector}::"ConnectorState", ${data.key}::"KeyState",
        ${data.engine}::"EngineState", ${JSON.stringify(data.jumpers)}::jsonb, ${data.pid}::varchar, ${data.sensor}::varchar,
        ${data.valueEntered}::float8, ${data.unitEntered}::varchar, ${data.valueSi}::float8, ${data.overload}::boolean,
        ${data.siUnit}::varchar, ${data.meterOhms}::float8, ${data.phase}::"Phase", ${data.note}::text, NULL, ${data.clientKey}::varchar,
        ${data.takenById}::uuid, ${data.takenAt}::timestamptz, ${data.againstLocation}::"ProbeLocation", ${data.otherConnector}::"ConnectorState"
      FROM still
      RETURNING "seq", "jumpers"`;
    const row = rows[0];
    if (!row) return null;
    // The stored jumpers as the database gives them back (jsonb orders keys its own way), like every other answer.
    return { ...data, id, seq: Number(row.seq), supersedesId: null, jumpers: row.jumpers, takenBy, supersededBy: null };
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
