import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { canonicalJson, sha256Hex } from '../../src/proof-render';
import { FOREMAN_A, newVehicle, TECH_A, TECH_B } from '../support/fixtures';
import { startApi, type TestApi } from '../support/http';
import { diagnoseToEnd, simulatedReading } from '../support/simulate';
import { readPdf } from '../proof-render/pdf-tools';
import type { MeasurementRequest } from '../../src/engine/vocabulary';

describe('proof of repair over HTTP', () => {
  let api: TestApi;
  let roId: string;
  let circuitId: string;
  let number: string;
  const readings: MeasurementRequest[] = [];

  beforeAll(async () => {
    api = await startApi('postgresql');
    const ro = (
      await api.call('POST', '/api/repair-orders', {
        user: FOREMAN_A,
        body: { vehicle: newVehicle(), complaint: 'Reduced power, throttle code', codes: ['P0122'], technicianId: TECH_A },
      })
    ).body;
    roId = ro.id;
    number = ro.number;
    circuitId = (await api.call('POST', `/api/repair-orders/${roId}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor: 'TP', label: 'TP sensor 1' } })).body.id;
  });
  afterAll(async () => api?.close());

  it('answers 409 with the reason while the repair is not done', async () => {
    const res = await api.call('GET', `/api/repair-orders/${roId}/proof.pdf`, { user: TECH_A });
    expect(res.status).toBe(409);
    expect(res.body.error).toMatchObject({ code: 'proof.not_yet', status: 'open' });
  });

  it('proves a repair: diagnosis to the root cause, repair, the same tests after, foreman approval', async () => {
    const diagnosis = await diagnoseToEnd(api, TECH_A, roId, circuitId, 'signal_open');
    expect(diagnosis.conclusion.hypothesisId).toBe('signal_open');
    const repair = await api.call('POST', `/api/repair-orders/${roId}/repairs`, {
      user: TECH_A,
      body: { circuitId, part: 'signal', action: 'Spliced the signal wire with a sealed crimp sleeve', location: 'signal wire, 15 cm from the sensor connector', parts: [{ name: 'Sealed crimp sleeve', quantity: 1 }] },
    });
    expect(repair.status).toBe(201);
    const measured = (await api.call('GET', `/api/repair-orders/${roId}/measurements`, { user: TECH_A })).body.items as Array<{ request: MeasurementRequest }>;
    for (const m of measured.slice(0, 3)) {
      readings.push(m.request);
      const after = await api.call('POST', `/api/repair-orders/${roId}/measurements`, {
        user: TECH_A,
        body: { circuitId, ...m.request, ...simulatedReading('good', m.request), phase: 'verification' },
      });
      expect(after.status).toBe(201);
    }
    await api.call('POST', `/api/repair-orders/${roId}/status`, { user: TECH_A, body: { to: 'verified' } });
    expect((await api.call('POST', `/api/repair-orders/${roId}/reviews`, { user: TECH_A, body: { decision: 'approved' } })).status).toBe(403);
    expect((await api.call('POST', `/api/repair-orders/${roId}/reviews`, { user: FOREMAN_A, body: { decision: 'approved', comment: 'Splice checked' } })).status).toBe(201);

    const res = await fetch(`${api.url}/api/repair-orders/${roId}/proof.pdf`, { headers: await api.authHeaders(TECH_A) });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('application/pdf');
    const pdf = Buffer.from(await res.arrayBuffer());
    const digest = res.headers.get('x-proof-digest')!;
    // Lines wrap where the layout decides: compare with white space folded.
    const text = (await readPdf(pdf)).pages.map((p) => p.text).join('\n').replace(/\s+/g, ' ');
    // Text extraction with pdfjs-dist: the document states the vehicle, the order, the cause and the approval.
    expect(text).toContain('1M8GDM9AXKP042788');
    expect(text).toContain(number);
    expect(text).toContain('Signal wire open between sensor and module');
    expect(text).toContain('Fore Person');
    expect(text.replace(/\s+/g, '')).toContain(digest.replace(/\s+/g, '').slice(0, 32));

    // The same evidence gives the same bytes (deterministic output).
    const again = Buffer.from(await (await fetch(`${api.url}/api/repair-orders/${roId}/proof.pdf`, { headers: await api.authHeaders(TECH_A) })).arrayBuffer());
    expect(again.equals(pdf)).toBe(true);

    const byDigest = await api.call('POST', '/api/proofs/verify', { user: TECH_A, body: { digest } });
    expect(byDigest.body).toMatchObject({ matches: true, known: true, repairOrder: { id: roId } });
    const byFile = await fetch(`${api.url}/api/proofs/verify`, { method: 'POST', headers: { ...(await api.authHeaders(TECH_A)), 'content-type': 'application/pdf' }, body: pdf });
    expect(await byFile.json()).toMatchObject({ matches: true, digest });
    const base64 = await api.call('POST', '/api/proofs/verify', { user: TECH_A, body: { pdfBase64: pdf.toString('base64') } });
    expect(base64.body.matches).toBe(true);
    // A file that merely carries the digest (an edited copy, or a forgery) is not the document issued.
    const forged = Buffer.from(`%PDF-1.3\n% sha256:${digest}\n`, 'latin1');
    const byForgery = await api.call('POST', '/api/proofs/verify', { user: TECH_A, body: { pdfBase64: forged.toString('base64') } });
    expect(byForgery.status).toBe(200);
    expect(byForgery.body).toMatchObject({ matches: false, known: false, digest });

    // After the approval is withdrawn, the old document no longer matches and the answer says why.
    await api.call('POST', `/api/repair-orders/${roId}/reviews`, { user: FOREMAN_A, body: { decision: 'withdrawn', comment: 'Wrong splice kit on the invoice' } });
    const stale = await api.call('POST', '/api/proofs/verify', { user: TECH_A, body: { digest } });
    expect(stale.body.matches).toBe(false);
    expect(stale.body.changes.map((c: { code: string }) => c.code)).toContain('approval.withdrawn');
    expect((await api.call('POST', '/api/proofs/verify', { user: TECH_B, body: { digest } })).body.known).toBe(false);
  });

  it('carries the high-voltage caution on the proof of a vehicle with a high-voltage system', async () => {
    const ro = (await api.call('POST', '/api/repair-orders', { user: FOREMAN_A, body: { vehicle: newVehicle({ vin: '9ZZEV12K7R0000017', highVoltageSystem: true }), complaint: 'Hybrid, throttle code', technicianId: TECH_A } })).body;
    const circuit = (await api.call('POST', `/api/repair-orders/${ro.id}/circuits`, { user: TECH_A, body: { kind: 'three_wire_5v', sensor: 'TP', label: 'TP sensor 1' } })).body.id;
    await diagnoseToEnd(api, TECH_A, ro.id, circuit, 'signal_open');
    await api.call('POST', `/api/repair-orders/${ro.id}/repairs`, { user: TECH_A, body: { circuitId: circuit, part: 'signal', action: 'Spliced the signal wire', parts: [] } });
    const res = await fetch(`${api.url}/api/repair-orders/${ro.id}/proof.pdf`, { headers: await api.authHeaders(TECH_A) });
    expect(res.status).toBe(200);
    const text = (await readPdf(Buffer.from(await res.arrayBuffer()))).pages.map((p) => p.text).join('\n').replace(/\s+/g, ' ');
    expect(text).toContain('High-voltage hybrid or electric system.');
    expect(text).toContain("disabling the high-voltage system by the service information's procedure");
  });

  it('says a digest nobody issued is unknown, and refuses input that carries no digest', async () => {
    // SHA-256 of "abc" (FIPS 180-2, appendix B.1): a well-formed digest that no proof here has.
    const abc = sha256Hex('abc');
    expect(abc).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect((await api.call('POST', '/api/proofs/verify', { user: TECH_A, body: { digest: abc } })).body).toMatchObject({ matches: false, known: false });
    const junk = await api.call('POST', '/api/proofs/verify', { user: TECH_A, body: { digest: 'not-a-digest' } });
    expect(junk.status).toBe(400);
    expect(junk.body.error.findings[0].path).toBe('body.digest');
    const neither = await api.call('POST', '/api/proofs/verify', { user: TECH_A, body: {} });
    expect(neither.status).toBe(400);
    expect(canonicalJson({ b: 1, a: 2 })).toBe('{"a":2,"b":1}');
  });
});
