// Text that could mislead whoever reads it: names and one-line fields refuse control and direction characters
// and invisible-only values with a 400 naming the field; free text is stored in NFC and, where it keeps direction
// controls, the pages and the PDF show them as marks; input the database refuses is logged as a warning.
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { AppLogger } from '../../src/common/logging/app-logger';
import { BACKENDS } from '../support/db';
import { ADMIN_A, FOREMAN_A, newVehicle, TECH_A } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';
import { syntheticTree } from '../support/synthetic-tree';

const person = (name: string) => ({ name, email: `p${Math.random().toString(36).slice(2, 10)}@a.test`, role: 'technician', password: 'violet harbour ferry lamp' });

describe.each(BACKENDS)('text input on the %s database', (backend) => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startApi(backend);
  });
  afterAll(async () => api?.close());
  afterEach(() => vi.restoreAllMocks());

  it.each([
    ['a C1 control U+0085', 'Nell\u0085Ames', 'U+0085'],
    ['a C1 control U+009B', 'Nell\u009BAmes', 'U+009B'],
    ['only zero-width spaces', '\u200B\u200B\u200B', 'visible characters'],
    ['the direction override U+202E', 'Nell \u202EsemA', 'U+202E'],
    ['a line break', 'Nell\nAmes', 'line break'],
  ])('refuses a person’s name with %s, naming the field', async (_what, name, expected) => {
    const res = await api.call('POST', '/api/users', { user: ADMIN_A, body: person(name) });
    expect(res.status).toBe(400);
    expect(res.body.error.findings).toEqual([expect.objectContaining({ path: 'body.name', message: expect.stringContaining(expected) })]);
  });

  it('stores a name in Unicode NFC (a decomposed "é" comes back composed)', async () => {
    const res = await api.call('POST', '/api/users', { user: ADMIN_A, body: person('Rene\u0301 Okafor') });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.name ?? res.body.user?.name).toBe('René Okafor');
  });

  it.each([
    ['a circuit label with U+202E', 'circuit', { kind: 'three_wire_5v', sensor: 'TP', label: 'TP \u202E2' }, 'body.label'],
    ['a vehicle make of only zero-width spaces', 'order', { vehicle: newVehicle({ make: '\u200B\u200B' }), complaint: 'x' }, 'body.vehicle.make'],
    ['a complaint with an escape character', 'order', { vehicle: newVehicle(), complaint: 'Stalls \u001B[2J' }, 'body.complaint'],
  ])('refuses %s with a 400 naming the field', async (_what, kind, body, path) => {
    let url = '/api/repair-orders';
    if (kind === 'circuit') url = `/api/repair-orders/${(await api.call('POST', url, { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'x', technicianId: TECH_A } })).body.id}/circuits`;
    const res = await api.call('POST', url, { user: FOREMAN_A, body });
    expect(res.status).toBe(400);
    expect(res.body.error.findings.map((f: { path: string }) => f.path)).toContain(path);
  });

  it('keeps line breaks in a complaint and shows a direction override in it as a mark on the page', async () => {
    const complaint = 'Paid \u202E0001\u202C USD\nStalls at idle';
    const ro = await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint, technicianId: TECH_A } });
    expect(ro.status).toBe(201);
    expect(ro.body.complaint).toBe(complaint);
    const { cookie } = await api.sessionOf(FOREMAN_A);
    const page = await (await fetch(`${api.url}/bay/orders/${ro.body.id}`, { headers: { cookie } })).text();
    expect(page).toContain('Paid ⟨U+202E⟩0001⟨U+202C⟩ USD');
    expect(page).not.toContain('\u202E');
  });

  it('logs input the database refuses (a NUL) as a warning, not an error, and answers 400', async () => {
    const warn = vi.spyOn(AppLogger.prototype, 'warn');
    const error = vi.spyOn(AppLogger.prototype, 'error');
    const res = await api.call('POST', '/api/fault-trees', { user: FOREMAN_A, body: { ...syntheticTree({ tests: 2, outcomes: 2, causes: 2, id: 'nul-title' }), title: 'Tree \u0000 title' } });
    expect(res.status).toBe(400);
    expect(error).not.toHaveBeenCalled();
    expect(warn.mock.calls.map((c) => String(c[0])).join('\n')).toMatch(/refused|NUL|not storable/i);
  });
});
