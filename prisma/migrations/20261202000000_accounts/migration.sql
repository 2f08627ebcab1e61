-- CreateEnum
CREATE TYPE "SignInKind" AS ENUM ('page', 'api');

-- AlterTable
ALTER TABLE "User" ADD COLUMN     "failedSignIns" INTEGER NOT NULL DEFAULT 0,
ADD COLUMN     "lockedUntil" TIMESTAMPTZ(3),
ADD COLUMN     "passwordHash" TEXT;

-- CreateTable
CREATE TABLE "SignIn" (
    "id" UUID NOT NULL,
    "userId" UUID NOT NULL,
    "kind" "SignInKind" NOT NULL,
    "secretHash" VARCHAR(64) NOT NULL,
    "client" VARCHAR(200) NOT NULL DEFAULT '',
    "createdAt" TIMESTAMPTZ(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "expiresAt" TIMESTAMPTZ(3) NOT NULL,
    "revokedAt" TIMESTAMPTZ(3),

    CONSTRAINT "SignIn_pkey" PRIMARY KEY ("id")
);

-- CreateIndex
CREATE UNIQUE INDEX "SignIn_secretHash_key" ON "SignIn"("secretHash");

-- CreateIndex
CREATE INDEX "SignIn_userId_expiresAt_idx" ON "SignIn"("userId", "expiresAt");

-- AddForeignKey
ALTER TABLE "SignIn" ADD CONSTRAINT "SignIn_userId_fkey" FOREIGN KEY ("userId") REFERENCES "User"("id") ON DELETE RESTRICT ON UPDATE CASCADE;
