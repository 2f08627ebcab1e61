/**
 * Checking a proof without an account (the address printed on it and carried by its QR code), handing the PDF over
 * as a raw body or a multipart upload, the shop's settings, and bodies read only after sign-in.
 */
import { request as httpRequest } from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BACKENDS } from '../support/db';
import { ADMIN_A, FOREMAN_A, newVehicle, TECH_A, TECH_B } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';
import { diagnoseToEnd, simulatedReading } from '../support/simulate';
import { readPdf } from '../proof-render/pdf-tools';

describe.each(BACKENDS)('checking a proof without an account on the %s database', (backend) => {
  let api: TestApi;
  let roId: string;
  let number: string;
  let circuitId: string;
  let pdf: Buffer;
  let digest: string;

  beforeAll(async () => {
    api = await startApi(backend);
    const ro = (await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle(), complaint: 'Customer Jane Privatename reports stalling', codes: ['P0122'], technicianId: TECH_A } })).body;
    roId = ro.id;
    number = ro.number;
    circuitId = (await api.call('POST', `/api/repair-orders/${roId}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor: 'TP', label: 'TP sensor 1' } })).body.id;
    await diagnoseToEnd(api, TECH_A, roId, circuitId, 'signal_open');
    expect((await api.call('POST', `/api/repair-orders/${roId}/repairs`, { user: TECH_A, body: { circuitId, part: 'signal', action: 'Spliced the signal wire', labourMinutes: 42 } })).status).toBe(201);
    const res = await fetch(`${api.url}/api/repair-orders/${roId}/proof.pdf`, { headers: await api.authHeaders(TECH_A) });
    pdf = Buffer.from(await res.arrayBuffer());
    digest = res.headers.get('x-proof-digest')!;
  }, 120_000);
  afterAll(async () => api?.close());

  const publicCheck = (d: string, accept = 'application/json') => fetch(`${api.url}/proofs/${d}`, { headers: { accept } });

  it('answers signed out, for the printed sha256: form too: known, which shop, issue date, order number, VIN, current', async () => {
    for (const form of [digest, `sha256:${digest}`, digest.toUpperCase()]) {
      const res = await publicCheck(encodeURIComponent(form));
      expect(res.status).toBe(200);
      const body = await res.json();
      expect(body).toEqual({
        known: true,
        digest,
        shop: 'Test Bay One',
        issuedOn: expect.stringMatching(/^\d{4}-\d{2}-\d{2}$/),
        repairOrderNumber: number,
        vin: '1M8GDM9AXKP042788',
        current: true,
        supersededBy: [],
      });
    }
  });

  it('leaks no people, no customer text and no readings, in JSON or as the page', async () => {
    for (const accept of ['application/json', 'text/html']) {
      const text = await (await publicCheck(digest, accept)).text();
      for (const secret of ['Jane Privatename', 'Tech One', 'Fore Person', 'Spliced', ' V', 'Ω', circuitId, roId]) expect(text).not.toContain(secret);
    }
    expect((await publicCheck(digest, 'text/html')).headers.get('content-type')).toMatch(/text\/html/);
  });

  it('prints the public address and puts it in the QR code', async () => {
    const text = (await readPdf(pdf)).pages.map((p) => p.text).join(' ').replace(/\s+/g, '');
    expect(text).toContain(`/proofs/${digest}`);
  });

  it('says an unknown digest is unknown (404) and refuses a malformed one (400)', async () => {
    const unknown = await publicCheck('ab'.repeat(32));
    expect(unknown.status).toBe(404);
    expect(await unknown.json()).toMatchObject({ known: false });
    expect((await publicCheck('not-a-digest')).status).toBe(400);
  });

  it('names the kind of change that superseded the document, and nothing more', async () => {
    const request = (await api.call('GET', `/api/repair-orders/${roId}/verification`, { user: TECH_A })).body.toMeasure[0].request;
    expect((await api.call('POST', `/api/repair-orders/${roId}/measurements`, { user: TECH_A, body: { circuitId, ...request, ...simulatedReading('good', request), phase: 'verification' } })).status).toBe(201);
    const body = await (await publicCheck(digest)).json();
    expect(body).toMatchObject({ known: true, current: false, supersededBy: ['readings added or corrected'] });
  });

  it('checks the PDF handed over as a raw body and as a multipart upload', async () => {
    const auth = await api.authHeaders(TECH_A);
    const raw = await fetch(`${api.url}/api/proofs/verify`, { method: 'POST', headers: { ...auth, 'content-type': 'application/pdf' }, body: pdf });
    expect(await raw.json()).toMatchObject({ known: true, digest });
    const form = new FormData();
    form.append('file', new Blob([pdf], { type: 'application/pdf' }), 'proof.pdf');
    const multipart = await fetch(`${api.url}/api/proofs/verify`, { method: 'POST', headers: auth, body: form });
    expect(multipart.status).toBe(200);
    expect(await multipart.json()).toMatchObject({ known: true, digest, repairOrder: { number } });
    const printed = await api.call('POST', '/api/proofs/verify', { user: TECH_A, body: { digest: `sha256:${digest}` } });
    expect(printed.body).toMatchObject({ known: true, digest });
    expect((await api.call('POST', '/api/proofs/verify', { user: TECH_B, body: { digest } })).body.known).toBe(false);
  });

  it('answers a signed-out upload 401 before reading its body', async () => {
    // 20 MB announced, 64 kB sent, the rest held back: the answer must come without waiting for it.
    const status = await new Promise<number>((resolve, reject) => {
      const req = httpRequest(`${api.url}/api/proofs/verify`, { method: 'POST', headers: { 'content-type': 'application/pdf', 'content-length': String(20 * 1024 * 1024) } }, (res) => {
        resolve(res.statusCode!);
        res.resume();
        req.destroy();
      });
      req.on('error', reject);
      req.write(Buffer.alloc(64 * 1024));
      setTimeout(() => reject(new Error('no answer within 5 s: the body was waited for')), 5000).unref();
    });
    expect(status).toBe(401);
  });

  it('keeps the shop settings: paper and time zone on the proof, the public check switched off', async () => {
    expect((await api.call('GET', '/api/shop', { user: TECH_A })).body).toMatchObject({ paperSize: 'A4', timeZone: 'UTC', publicProofCheck: true });
    expect((await api.call('PATCH', '/api/shop', { user: TECH_A, body: { paperSize: 'Letter' } })).status).toBe(403);
    const bad = await api.call('PATCH', '/api/shop', { user: ADMIN_A, body: { timeZone: 'Mars/Olympus', paperSize: 'A3' } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.findings.map((f: { path: string }) => f.path).sort()).toEqual(['body.paperSize', 'body.timeZone']);
    const set = await api.call('PATCH', '/api/shop', { user: FOREMAN_A, body: { paperSize: 'Letter', timeZone: 'America/Chicago', publicProofCheck: false } });
    expect(set.body).toMatchObject({ paperSize: 'Letter', timeZone: 'America/Chicago', publicProofCheck: false });

    const letter = Buffer.from(await (await fetch(`${api.url}/api/repair-orders/${roId}/proof.pdf`, { headers: await api.authHeaders(TECH_A) })).arrayBuffer());
    const read = await readPdf(letter);
    expect(read.pages[0]!.width).toBeCloseTo(612, 0);
    expect(read.pages[0]!.height).toBeCloseTo(792, 0);
    // Stored in UTC, printed in the shop's zone with its offset (Chicago is UTC−06:00 or −05:00).
    expect(read.pages.map((p) => p.text).join(' ')).toMatch(/UTC−0[56]:00/);

    const off = await publicCheck(digest);
    expect(off.status).toBe(404);
    expect(await off.json()).toMatchObject({ known: false });
    await api.call('PATCH', '/api/shop', { user: FOREMAN_A, body: { paperSize: 'A4', timeZone: 'UTC', publicProofCheck: true } });
  });
});
