/** A small invented shop for tests: a foreman, an admin, two technicians, and a second shop to prove scoping. */
import type { PrismaClient } from '../../src/generated/prisma/client';
import { hashPassword } from '../../src/modules/auth/secrets';

export const SHOP_A = '0a0a0a0a-0000-4000-8000-00000000000a';
export const SHOP_B = '0b0b0b0b-0000-4000-8000-00000000000b';
export const FOREMAN_A = '0a0a0a0a-0000-4000-8000-0000000000f1';
export const TECH_A = '0a0a0a0a-0000-4000-8000-0000000000e1';
export const TECH_A2 = '0a0a0a0a-0000-4000-8000-0000000000e2';
export const INACTIVE_A = '0a0a0a0a-0000-4000-8000-0000000000d1';
export const TECH_B = '0b0b0b0b-0000-4000-8000-0000000000e1';
export const ADMIN_A = '0a0a0a0a-0000-4000-8000-0000000000a1';
export const FOREMAN_B = '0b0b0b0b-0000-4000-8000-0000000000f1';
export const ADMIN_B = '0b0b0b0b-0000-4000-8000-0000000000a1';

/** Every fixture person signs in with this (invented) password; `test/support/http.ts` does it for `{ user }`. */
export const FIXTURE_PASSWORD = 'gravel path under seven lamps';

/** Email of each fixture person, by id. */
export const FIXTURE_EMAILS: Readonly<Record<string, string>> = {
  [FOREMAN_A]: 'fore@a.test',
  [TECH_A]: 'one@a.test',
  [TECH_A2]: 'two@a.test',
  [INACTIVE_A]: 'gone@a.test',
  [TECH_B]: 'other@b.test',
  [ADMIN_A]: 'admin@a.test',
  [FOREMAN_B]: 'fore@b.test',
  [ADMIN_B]: 'admin@b.test',
};

let fixtureHash: Promise<string> | undefined;

/** Valid North American VINs (49 CFR 565 check digit): the regulation's sample and a textbook one. */
export const VIN_SAMPLE = '1G4AH59H45G118341';
export const VIN_TEXTBOOK = '1M8GDM9AXKP042788';

export async function seedShops(prisma: PrismaClient): Promise<void> {
  await prisma.shop.createMany({
    data: [
      { id: SHOP_A, name: 'Test Bay One', address: '1 Test Lane' },
      { id: SHOP_B, name: 'Test Bay Two', address: '2 Test Lane' },
    ],
  });
  const passwordHash = await (fixtureHash ??= hashPassword(FIXTURE_PASSWORD));
  const people = [
    { id: FOREMAN_A, shopId: SHOP_A, name: 'Fore Person', role: 'foreman' },
    { id: TECH_A, shopId: SHOP_A, name: 'Tech One', role: 'technician' },
    { id: TECH_A2, shopId: SHOP_A, name: 'Tech Two', role: 'technician' },
    { id: INACTIVE_A, shopId: SHOP_A, name: 'Gone Away', role: 'technician', active: false },
    { id: TECH_B, shopId: SHOP_B, name: 'Other Tech', role: 'technician' },
    { id: ADMIN_A, shopId: SHOP_A, name: 'Admin One', role: 'admin' },
    { id: FOREMAN_B, shopId: SHOP_B, name: 'Other Fore', role: 'foreman' },
    { id: ADMIN_B, shopId: SHOP_B, name: 'Other Admin', role: 'admin' },
  ] as const;
  await prisma.user.createMany({ data: people.map((p) => ({ ...p, email: FIXTURE_EMAILS[p.id]!, passwordHash })) });
}

export function newVehicle(overrides: Record<string, unknown> = {}) {
  return { vin: VIN_TEXTBOOK, year: 2019, make: 'Testmake', model: 'Testmodel', engine: '2.0 L', odometer: 52_000, ...overrides };
}
