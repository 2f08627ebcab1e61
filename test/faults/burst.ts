/**
 * A burst of readings from several tablets at once, each request with its own client timeout, recording what the
 * service acknowledged. Each reading carries a client key, so the database can be asked afterwards for exactly the
 * readings that were acknowledged.
 */
import { newVehicle } from '../support/fixtures';

export interface Sent {
  clientKey: string;
  /** HTTP status, or 0 when the request failed without an answer (connection refused or reset, timeout). */
  status: number;
  /** Id of the stored reading in a 2xx answer. */
  id?: string;
  retryAfter?: string | null;
  errorCode?: string;
  /** Client-side failure: the error's name/code (e.g. TimeoutError, ECONNREFUSED). */
  failure?: string;
  ms: number;
}

export async function createOrderWithCircuit(url: string, headers: Record<string, string>): Promise<{ roId: string; circuitId: string }> {
  const post = async (path: string, body: unknown) => {
    const res = await fetch(url + path, { method: 'POST', headers: { ...headers, 'content-type': 'application/json' }, body: JSON.stringify(body), signal: AbortSignal.timeout(10_000) });
    const json = (await res.json()) as { id: string };
    if (res.status !== 201) throw new Error(`POST ${path} answered ${res.status}: ${JSON.stringify(json)}`);
    return json;
  };
  const ro = await post('/api/repair-orders', { vehicle: newVehicle(), complaint: 'MAP sensor voltage low code, intermittent', codes: ['P0107'] });
  const circuit = await post(`/api/repair-orders/${ro.id}/circuits`, { kind: 'three_wire_5v', sensor: 'MAP', label: 'MAP sensor' });
  return { roId: ro.id, circuitId: circuit.id };
}

/** A reference-voltage reading at the sensor connector, back-probed, key on engine off: the first test of most trees. */
export function referenceReading(circuitId: string, clientKey: string, volts: number) {
  return {
    circuitId,
    quantity: 'dc_volts',
    at: 'reference',
    against: 'ground',
    location: 'sensor_connector',
    connector: 'backprobed',
    key: 'on',
    engine: 'off',
    value: volts,
    unit: 'V',
    clientKey,
  };
}

export interface BurstOptions {
  url: string;
  headers: Record<string, string>;
  roId: string;
  circuitId: string;
  /** Requests in flight at once. */
  concurrency: number;
  /** Client timeout of each request. */
  timeoutMs: number;
  /** Stops issuing new requests once this returns true (checked before each request). */
  until: (sent: readonly Sent[]) => boolean;
  /** Prefix of the client keys, unique per burst. */
  keyPrefix: string;
  /** Pause between one tablet's requests. */
  pauseMs?: number;
}

export async function burst(options: BurstOptions): Promise<Sent[]> {
  const sent: Sent[] = [];
  let next = 0;
  const tablet = async () => {
    while (!options.until(sent)) {
      const clientKey = `${options.keyPrefix}-${String(next++).padStart(6, '0')}`;
      const started = performance.now();
      const record: Sent = { clientKey, status: 0, ms: 0 };
      try {
        const res = await fetch(`${options.url}/api/repair-orders/${options.roId}/measurements`, {
          method: 'POST',
          headers: { ...options.headers, 'content-type': 'application/json' },
          body: JSON.stringify(referenceReading(options.circuitId, clientKey, 4.95 + (next % 10) / 1000)),
          signal: AbortSignal.timeout(options.timeoutMs),
        });
        record.status = res.status;
        record.retryAfter = res.headers.get('retry-after');
        const body = (await res.json().catch(() => ({}))) as { id?: string; error?: { code?: string } };
        if (res.ok) record.id = body.id;
        else record.errorCode = body.error?.code;
      } catch (error) {
        const e = error as { name?: string; cause?: { code?: string } };
        record.failure = e.cause?.code ?? e.name ?? String(error);
      }
      record.ms = performance.now() - started;
      sent.push(record);
      if (options.pauseMs) await new Promise((r) => setTimeout(r, options.pauseMs));
    }
  };
  await Promise.all(Array.from({ length: options.concurrency }, tablet));
  return sent;
}

/** Counts of outcomes by status (0 = no answer, with the client-side failure), for failure messages. */
export function tally(sent: readonly Sent[]): Record<string, number> {
  const counts: Record<string, number> = {};
  for (const s of sent) {
    const key = s.status === 0 ? `no answer (${s.failure})` : `${s.status}${s.errorCode ? ` ${s.errorCode}` : ''}`;
    counts[key] = (counts[key] ?? 0) + 1;
  }
  return counts;
}

/**
 * A burst into a running service that is killed with SIGKILL once `killAfter` readings were acknowledged (with
 * up to `concurrency` more in flight); resolves when the process is gone, with every request's outcome.
 */
export async function burstUntilKilled(
  service: { url: string; child: { kill(signal: NodeJS.Signals): boolean } },
  options: Omit<BurstOptions, 'url' | 'until'> & { killAfter: number; maxRequests: number },
): Promise<Sent[]> {
  let killed = false;
  const { killAfter, maxRequests, ...rest } = options;
  return burst({
    ...rest,
    url: service.url,
    until: (so) => {
      if (!killed && so.filter((s) => s.status === 201).length >= killAfter) {
        killed = true;
        service.child.kill('SIGKILL');
      }
      return killed || so.length >= maxRequests;
    },
  });
}
