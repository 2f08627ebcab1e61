/** A small invented shop for tests: one foreman, two technicians, and a second shop to prove scoping. */
import type { PrismaClient } from '../../src/generated/prisma/client';

export const SHOP_A = '0a0a0a0a-0000-4000-8000-00000000000a';
export const SHOP_B = '0b0b0b0b-0000-4000-8000-00000000000b';
export const FOREMAN_A = '0a0a0a0a-0000-4000-8000-0000000000f1';
export const TECH_A = '0a0a0a0a-0000-4000-8000-0000000000e1';
export const TECH_A2 = '0a0a0a0a-0000-4000-8000-0000000000e2';
export const INACTIVE_A = '0a0a0a0a-0000-4000-8000-0000000000d1';
export const TECH_B = '0b0b0b0b-0000-4000-8000-0000000000e1';

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
  await prisma.user.createMany({
    data: [
      { id: FOREMAN_A, shopId: SHOP_A, name: 'Fore Person', email: 'fore@a.test', role: 'foreman' },
      { id: TECH_A, shopId: SHOP_A, name: 'Tech One', email: 'one@a.test', role: 'technician' },
      { id: TECH_A2, shopId: SHOP_A, name: 'Tech Two', email: 'two@a.test', role: 'technician' },
      { id: INACTIVE_A, shopId: SHOP_A, name: 'Gone Away', email: 'gone@a.test', role: 'technician', active: false },
      { id: TECH_B, shopId: SHOP_B, name: 'Other Tech', email: 'other@b.test', role: 'technician' },
    ],
  });
}

export function newVehicle(overrides: Record<string, unknown> = {}) {
  return { vin: VIN_TEXTBOOK, year: 2019, make: 'Testmake', model: 'Testmodel', engine: '2.0 L', odometer: 52_000, ...overrides };
}
