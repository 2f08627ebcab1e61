-- CreateTable
CREATE TABLE "OrderNumbering" (
    "id" UUID NOT NULL,
    "shopId" UUID NOT NULL,
    "prefix" VARCHAR(10) NOT NULL DEFAULT 'RO-',
    "width" INTEGER NOT NULL DEFAULT 5,
    "next" BIGINT NOT NULL DEFAULT 1,

    CONSTRAINT "OrderNumbering_pkey" PRIMARY KEY ("id")
);

-- CreateIndex
CREATE UNIQUE INDEX "OrderNumbering_shopId_key" ON "OrderNumbering"("shopId");

-- AddForeignKey
ALTER TABLE "OrderNumbering" ADD CONSTRAINT "OrderNumbering_shopId_fkey" FOREIGN KEY ("shopId") REFERENCES "Shop"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- Existing shops continue from their own numbers: the prefix most of their orders use ("RO-" when none), the
-- widest run of digits after it, and one past the highest. Numbers of more than 9 digits were typed by hand and
-- are not followed.
INSERT INTO "OrderNumbering" ("id", "shopId", "prefix", "width", "next")
SELECT gen_random_uuid(), s."id", COALESCE(p."prefix", 'RO-'), COALESCE(p."width", 5), COALESCE(p."highest", 0) + 1
FROM "Shop" s
LEFT JOIN LATERAL (
    SELECT substring(o."number" FROM '^([A-Z]{1,9}-)') AS "prefix",
           max(length(substring(o."number" FROM '([0-9]+)$'))) AS "width",
           max(substring(o."number" FROM '([0-9]+)$')::bigint) AS "highest"
    FROM "RepairOrder" o
    WHERE o."shopId" = s."id" AND o."number" ~ '^[A-Z]{1,9}-[0-9]{1,9}$'
    GROUP BY 1
    ORDER BY count(*) DESC, max(o."createdAt") DESC
    LIMIT 1
) p ON true;

-- A change of prefix or width is in the trail (each number taken is not: the orders record themselves).
CREATE TRIGGER "OrderNumbering_audit" AFTER INSERT OR UPDATE OF "prefix", "width" ON "OrderNumbering"
    FOR EACH ROW EXECUTE FUNCTION "tracebay_audit"('order_numbering', '', 'only', 'id', 'shopId', 'prefix', 'width');
