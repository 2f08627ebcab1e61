import { Injectable } from '@nestjs/common';
import { randomUUID } from 'node:crypto';
import { PrismaRepository, writeStamp } from '../../common/database/prisma-repository';
import type { CircuitKind, RepairOrderStatus } from '../../generated/prisma/client';
import type { Actor } from '../identity/actor';
import type { CircuitOfOrder } from '../repair-orders/repair-orders.repository';
import type { RepairRow } from '../repairs/repairs.repository';
import type { MeasurementRow, NewReading } from './measurements.repository';

/** What recording a reading needs before it writes: who calls (as the database has them now), their count, the order. */
export interface ReadingContext {
  /** Null when the sign-in ended (signed out, expired, person deactivated) on any instance. */
  actor: Actor | null;
  /** The caller's writes in the current window, counted by this statement; null when writes are not limited. */
  writes: { hits: number; resetSeconds: number } | null;
  order: { id: string; status: RepairOrderStatus; version: number; number: string; createdAt: Date; circuits: CircuitOfOrder[]; vehicle: { highVoltageSystem: boolean } } | null;
}

/** The stored reading, with (when asked for) every reading of its circuit and the order's repairs, for the diagnosis. */
export interface StoredReading {
  row: MeasurementRow;
  history: { readings: MeasurementRow[]; repairs: RepairRow[] } | null;
}

type Json = Record<string, unknown>;

function measurementFrom(m: Json): MeasurementRow {
  const superseding = m.supersededBy as (Json & { takenAt: string }) | null;
  return {
    ...(m as unknown as MeasurementRow),
    takenAt: new Date(m.takenAt as string),
    supersededBy: superseding ? { ...(superseding as unknown as NonNullable<MeasurementRow['supersededBy']>), takenAt: new Date(superseding.takenAt) } : null,
  };
}

/**
 * The two statements of a reading on the hot path (one new reading, no correction, no Idempotency-Key), sent
 * through the driver itself: Prisma's work per query cost more CPU than these statements do.
 */
@Injectable()
export class ReadingRepository extends PrismaRepository {
  /**
   * One statement: the sign-in still live and its person active (whatever instance ended it), the write counted
   * against the person's budget (only when the sign-in is live), and the order, scoped to what the person may see
   * now, with its circuits.
   */
  async context(signInId: string, now: Date, budget: { bucket: string; windowSeconds: number } | undefined, repairOrderId: string): Promise<ReadingContext> {
    const rows = await this.sql<Json>(
      `WITH who AS (
        SELECT u."id", u."shopId", u."name", u."role"::text AS "role"
        FROM "SignIn" s JOIN "User" u ON u."id" = s."userId"
        WHERE s."id" = $1::uuid AND s."revokedAt" IS NULL AND s."expiresAt" > $2::timestamptz AND u."active"
      ),
      hit AS (
        INSERT INTO "RateLimitHit" ("bucket", "windowStart", "hits")
        SELECT $3::varchar, to_timestamp(floor(EXTRACT(EPOCH FROM clock_timestamp()) / $4::int) * $4::int), 1
        FROM who WHERE $3::varchar IS NOT NULL
        ON CONFLICT ("bucket", "windowStart") DO UPDATE SET "hits" = "RateLimitHit"."hits" + 1
        RETURNING "hits", EXTRACT(EPOCH FROM ("windowStart" + make_interval(secs => $4::int) - clock_timestamp()))::float8 AS "resetSeconds"
      )
      SELECT who."id" AS "userId", who."shopId", who."name", who."role",
        (SELECT "hits" FROM hit) AS "hits", (SELECT "resetSeconds" FROM hit) AS "resetSeconds",
        o."id", o."status"::text AS "status", o."version", o."number", o."createdAt",
        (SELECT COALESCE(json_agg(json_build_object('id', c."id", 'kind', c."kind", 'faultTreeId', c."faultTreeId", 'sensor', c."sensor") ORDER BY c."createdAt", c."id"), '[]'::json)
          FROM "Circuit" c WHERE c."repairOrderId" = o."id") AS "circuits",
        (SELECT v."highVoltageSystem" FROM "Vehicle" v WHERE v."id" = o."vehicleId") AS "highVoltageSystem"
      FROM who LEFT JOIN "RepairOrder" o ON o."id" = $5::uuid AND o."shopId" = who."shopId"
        AND (who."role" <> 'technician' OR o."technicianId" = who."id" OR o."createdById" = who."id")`,
      [signInId, now, budget ? budget.bucket : null, budget?.windowSeconds ?? 1, repairOrderId],
    );
    const r = rows[0];
    if (!r) return { actor: null, writes: null, order: null };
    return {
      actor: { userId: r.userId as string, shopId: r.shopId as string, name: r.name as string, role: r.role as Actor['role'] },
      writes: r.hits === null || r.hits === undefined ? null : { hits: Number(r.hits), resetSeconds: Number(r.resetSeconds) },
      order: r.id
        ? {
            id: r.id as string,
            status: r.status as RepairOrderStatus,
            version: Number(r.version),
            number: r.number as string,
            createdAt: r.createdAt as Date,
            circuits: r.circuits as Array<{ id: string; kind: CircuitKind; faultTreeId: string | null; sensor: string }>,
            vehicle: { highVoltageSystem: r.highVoltageSystem === true },
          }
        : null,
    };
  }

  /**
   * One statement, its own transaction: tells the audit triggers who writes, stores the reading only while the
   * order still has the status (and, for an open order, the version) it was checked against, touches the order,
   * and moves an open order to diagnosing with its status entry (the first reading starts the diagnosis). With
   * `history`, it also answers every reading of the circuit (this one included) and the order's repairs. Null
   * when the order moved on meanwhile (nothing stored); undefined outside a request or with an Idempotency-Key,
   * whose record `transaction()` marks together with the write.
   */
  async store(order: { status: RepairOrderStatus; version: number }, takenBy: { id: string; name: string }, data: NewReading, history: boolean): Promise<StoredReading | null | undefined> {
    const stamp = writeStamp();
    if (!stamp || stamp.idempotencyId) return undefined;
    const id = randomUUID();
    // The stamp is set before the order is updated and the rows inserted (the UPDATE waits on it); the audit
    // triggers fire at the end of the statement. A statement sees the tables as they were when it began, so the
    // new reading is added to the circuit's readings by hand.
    const rows = await this.sql<{ added: Json | null; readings: Json[] | null; repairs: Json[] | null }>(
      `WITH stamp AS (SELECT set_config('tracebay.context', $1, true) AS c),
      still AS (
        UPDATE "RepairOrder" SET "updatedAt" = $2::timestamptz,
          "status" = CASE WHEN "status" = 'open' THEN 'diagnosing'::"RepairOrderStatus" ELSE "status" END,
          "version" = CASE WHEN "status" = 'open' THEN "version" + 1 ELSE "version" END
        WHERE "id" = $3::uuid AND "status" = $4::"RepairOrderStatus" AND ("status" <> 'open' OR "version" = $5::int) AND EXISTS (SELECT 1 FROM stamp)
        RETURNING "id", "status"
      ),
      moved AS (
        INSERT INTO "StatusChange" ("id", "repairOrderId", "fromStatus", "toStatus", "reason", "byId", "fromVersion")
        SELECT $6::uuid, still."id", 'open', 'diagnosing', 'first reading recorded', $7::uuid, $5::int FROM still WHERE $4::"RepairOrderStatus" = 'open'
        RETURNING "id"
      ),
      added AS (
        INSERT INTO "Measurement" ("id", "repairOrderId", "circuitId", "quantity", "at", "against", "location", "connector", "key",
          "engine", "jumpers", "pid", "sensor", "valueEntered", "unitEntered", "valueSi", "overload", "siUnit", "meterOhms", "phase",
          "note", "supersedesId", "clientKey", "takenById", "takenAt", "againstLocation", "otherConnector", "sensorInput")
        SELECT $8::uuid, still."id", $9::uuid, $10::"Quantity", $11::"ProbePoint", $12::"ProbePoint", $13::"ProbeLocation",
          $14::"ConnectorState", $15::"KeyState", $16::"EngineState", $17::jsonb, $18::varchar, $19::varchar, $20::float8, $21::varchar,
          $22::float8, $23::boolean, $24::varchar, $25::float8, $26::"Phase", $27::text, NULL, $28::varchar, $7::uuid, $29::timestamptz,
          $31::"ProbeLocation", $32::"ConnectorState", $33::"SensorInput"
        FROM still
        RETURNING *
      ),
      readings AS (
        SELECT m.* FROM "Measurement" m WHERE m."circuitId" = $9::uuid AND m."repairOrderId" = $3::uuid AND $30::boolean
        UNION ALL SELECT a.* FROM added a WHERE $30::boolean
      )
      SELECT
        (SELECT json_build_object('seq', a."seq", 'jumpers', a."jumpers") FROM added a) AS "added",
        (SELECT json_agg(to_jsonb(r) || jsonb_build_object(
            'takenBy', jsonb_build_object('id', u."id", 'name', u."name"),
            'supersededBy', CASE WHEN s."id" IS NULL THEN NULL
              ELSE jsonb_build_object('id', s."id", 'takenAt', s."takenAt", 'takenBy', jsonb_build_object('id', su."id", 'name', su."name")) END)
            ORDER BY r."takenAt", r."seq")
          FROM readings r JOIN "User" u ON u."id" = r."takenById"
          LEFT JOIN "Measurement" s ON s."supersedesId" = r."id" LEFT JOIN "User" su ON su."id" = s."takenById") AS "readings",
        (SELECT json_agg(to_jsonb(p) || jsonb_build_object('by', jsonb_build_object('id', u."id", 'name', u."name")) ORDER BY p."at", p."seq")
          FROM "Repair" p JOIN "User" u ON u."id" = p."byId" WHERE p."repairOrderId" = $3::uuid AND $30::boolean) AS "repairs"`,
      [
        stamp.context, new Date(), data.repairOrderId, order.status, order.version, randomUUID(), data.takenById,
        id, data.circuitId, data.quantity, data.at, data.against, data.location, data.connector, data.key, data.engine,
        JSON.stringify(data.jumpers), data.pid, data.sensor, data.valueEntered, data.unitEntered, data.valueSi, data.overload,
        data.siUnit, data.meterOhms, data.phase, data.note, data.clientKey, data.takenAt, history,
        data.againstLocation, data.otherConnector, data.sensorInput,
      ],
    );
    const r = rows[0];
    if (!r?.added) return null;
    // The stored jumpers as the database gives them back (jsonb orders keys its own way), like every other answer.
    const row: MeasurementRow = { ...data, id, seq: Number(r.added.seq), supersedesId: null, jumpers: r.added.jumpers as MeasurementRow['jumpers'], takenBy, supersededBy: null };
    if (!history) return { row, history: null };
    return {
      row,
      history: {
        readings: (r.readings ?? []).map(measurementFrom),
        repairs: (r.repairs ?? []).map((p) => ({ ...(p as unknown as RepairRow), at: new Date(p.at as string) })),
      },
    };
  }
}
