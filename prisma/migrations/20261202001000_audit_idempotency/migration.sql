-- CreateTable
CREATE TABLE "AuditEvent" (
    "id" BIGSERIAL NOT NULL,
    "at" TIMESTAMPTZ(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "shopId" UUID,
    "userId" UUID,
    "ip" VARCHAR(64),
    "userAgent" VARCHAR(512),
    "requestId" VARCHAR(64),
    "clientId" VARCHAR(64),
    "action" VARCHAR(64) NOT NULL,
    "entityType" VARCHAR(32) NOT NULL,
    "entityId" UUID NOT NULL,
    "repairOrderId" UUID,
    "row" JSONB NOT NULL,
    "changes" JSONB,

    CONSTRAINT "AuditEvent_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "IdempotencyKey" (
    "id" UUID NOT NULL,
    "shopId" UUID NOT NULL,
    "userId" UUID NOT NULL,
    "key" VARCHAR(255) NOT NULL,
    "requestHash" VARCHAR(64) NOT NULL,
    "method" VARCHAR(8) NOT NULL,
    "path" TEXT NOT NULL,
    "state" VARCHAR(16) NOT NULL,
    "status" INTEGER,
    "responseBody" TEXT,
    "committedAt" TIMESTAMPTZ(3),
    "createdAt" TIMESTAMPTZ(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "expiresAt" TIMESTAMPTZ(3) NOT NULL,

    CONSTRAINT "IdempotencyKey_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "RateLimitHit" (
    "bucket" VARCHAR(320) NOT NULL,
    "windowStart" TIMESTAMPTZ(3) NOT NULL,
    "hits" INTEGER NOT NULL DEFAULT 0,

    CONSTRAINT "RateLimitHit_pkey" PRIMARY KEY ("bucket","windowStart")
);

-- CreateIndex
CREATE INDEX "AuditEvent_repairOrderId_id_idx" ON "AuditEvent"("repairOrderId", "id");

-- CreateIndex
CREATE INDEX "AuditEvent_shopId_at_idx" ON "AuditEvent"("shopId", "at");

-- CreateIndex
CREATE INDEX "IdempotencyKey_expiresAt_idx" ON "IdempotencyKey"("expiresAt");

-- CreateIndex
CREATE UNIQUE INDEX "IdempotencyKey_shopId_userId_key_key" ON "IdempotencyKey"("shopId", "userId", "key");

-- CreateIndex
CREATE INDEX "RateLimitHit_windowStart_idx" ON "RateLimitHit"("windowStart");

-- The trail is evidence of the evidence: never changed in place, never deleted, never emptied.
CREATE TRIGGER "AuditEvent_append_only" BEFORE UPDATE OR DELETE ON "AuditEvent"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_refuse_change"();

CREATE TRIGGER "AuditEvent_no_truncate" BEFORE TRUNCATE ON "AuditEvent"
    FOR EACH STATEMENT EXECUTE FUNCTION "tracebay_refuse_change"();

-- On a server, no role but the owner may change it either (the embedded database has a single role; the
-- statements are kept in a block so the same file runs on both).
DO $$
BEGIN
    REVOKE UPDATE, DELETE, TRUNCATE ON "AuditEvent" FROM PUBLIC;
    IF EXISTS (SELECT 1 FROM pg_roles WHERE rolname = 'tracebay_app') THEN
        EXECUTE 'REVOKE UPDATE, DELETE, TRUNCATE ON "AuditEvent" FROM tracebay_app';
    END IF;
EXCEPTION WHEN insufficient_privilege OR undefined_object THEN
    RAISE NOTICE 'AuditEvent: role grants left as they are (%)', SQLERRM;
END;
$$;

-- Records one written row in the trail. Who and from where come from the transaction-local setting
-- "tracebay.context" (JSON: userId, shopId, ip, userAgent, requestId, clientId) that the service sets at the start
-- of each transaction; a write without it (seeding, a script) is still recorded, with the row's own author column.
-- Arguments: entity name, author column ('' for none), then optionally 'omit' or 'only' and a list of columns.
CREATE FUNCTION "tracebay_audit"() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
    ctx jsonb := NULLIF(current_setting('tracebay.context', true), '')::jsonb;
    entity text := TG_ARGV[0];
    author text := NULLIF(TG_ARGV[1], '');
    full_new jsonb := to_jsonb(NEW);
    written jsonb := full_new;
    old_row jsonb;
    diff jsonb;
    col text;
    act text;
    order_id uuid;
    i integer;
BEGIN
    IF TG_NARGS > 3 AND TG_ARGV[2] = 'omit' THEN
        FOR i IN 3 .. TG_NARGS - 1 LOOP
            written := written - TG_ARGV[i];
        END LOOP;
    ELSIF TG_NARGS > 3 AND TG_ARGV[2] = 'only' THEN
        written := '{}'::jsonb;
        FOR i IN 3 .. TG_NARGS - 1 LOOP
            IF full_new ? TG_ARGV[i] THEN
                written := written || jsonb_build_object(TG_ARGV[i], full_new -> TG_ARGV[i]);
            END IF;
        END LOOP;
    END IF;

    IF TG_OP = 'UPDATE' THEN
        old_row := to_jsonb(OLD);
        diff := '{}'::jsonb;
        FOR col IN SELECT jsonb_object_keys(written) LOOP
            -- "updatedAt" and "version" move with every change; they are not changes of their own.
            IF col NOT IN ('updatedAt', 'version') AND (written -> col) IS DISTINCT FROM (old_row -> col) THEN
                diff := diff || jsonb_build_object(col, jsonb_build_object('before', old_row -> col, 'after', written -> col));
            END IF;
        END LOOP;
        IF diff = '{}'::jsonb THEN
            RETURN NULL;
        END IF;
        act := entity || '.updated';
    ELSIF entity = 'measurement' AND (full_new ->> 'supersedesId') IS NOT NULL THEN
        act := 'measurement.corrected';
    ELSE
        act := entity || '.created';
    END IF;

    order_id := CASE WHEN entity = 'repair_order' THEN (full_new ->> 'id')::uuid ELSE (full_new ->> 'repairOrderId')::uuid END;

    INSERT INTO "AuditEvent" ("shopId", "userId", "ip", "userAgent", "requestId", "clientId", "action", "entityType", "entityId", "repairOrderId", "row", "changes")
    VALUES (
        COALESCE(
            (full_new ->> 'shopId')::uuid,
            (SELECT o."shopId" FROM "RepairOrder" o WHERE o."id" = order_id),
            (SELECT u."shopId" FROM "User" u WHERE u."id" = (full_new ->> 'userId')::uuid),
            (ctx ->> 'shopId')::uuid
        ),
        COALESCE((ctx ->> 'userId')::uuid, CASE WHEN author IS NULL THEN NULL ELSE (full_new ->> author)::uuid END),
        left(ctx ->> 'ip', 64),
        left(ctx ->> 'userAgent', 512),
        left(ctx ->> 'requestId', 64),
        left(ctx ->> 'clientId', 64),
        act,
        entity,
        (full_new ->> 'id')::uuid,
        order_id,
        written,
        diff
    );
    RETURN NULL;
END;
$$;

-- Every table a write can reach records itself in the trail.
CREATE TRIGGER "Shop_audit" AFTER INSERT OR UPDATE OF "name", "address" ON "Shop"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_audit"('shop', '', 'only', 'id', 'name', 'address');

-- Only the user's public fields: whatever else the table holds (credentials) stays out of the trail.
CREATE TRIGGER "User_audit" AFTER INSERT OR UPDATE OF "shopId", "name", "email", "role", "active" ON "User"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_audit"('user', '', 'only', 'id', 'shopId', 'name', 'email', 'role', 'active');

CREATE TRIGGER "Vehicle_audit" AFTER INSERT OR UPDATE ON "Vehicle"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_audit"('vehicle', 'createdById');

CREATE TRIGGER "RepairOrder_audit" AFTER INSERT OR UPDATE ON "RepairOrder"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_audit"('repair_order', 'createdById');

CREATE TRIGGER "StatusChange_audit" AFTER INSERT ON "StatusChange"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_audit"('status_change', 'byId');

CREATE TRIGGER "Circuit_audit" AFTER INSERT OR UPDATE ON "Circuit"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_audit"('circuit', 'createdById');

CREATE TRIGGER "Measurement_audit" AFTER INSERT ON "Measurement"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_audit"('measurement', 'takenById');

CREATE TRIGGER "Repair_audit" AFTER INSERT ON "Repair"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_audit"('repair', 'byId');

CREATE TRIGGER "Review_audit" AFTER INSERT ON "Review"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_audit"('review', 'byId');

CREATE TRIGGER "FaultTree_audit" AFTER INSERT ON "FaultTree"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_audit"('fault_tree', 'createdById', 'omit', 'document');

CREATE TRIGGER "ProofIssue_audit" AFTER INSERT ON "ProofIssue"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_audit"('proof_issue', 'issuedById', 'omit', 'view');

-- Sign-ins and sign-outs (the secret's hash stays out of the trail).
CREATE TRIGGER "SignIn_audit" AFTER INSERT OR UPDATE OF "revokedAt" ON "SignIn"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_audit"('sign_in', 'userId', 'omit', 'secretHash');
