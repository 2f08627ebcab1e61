import { type Finding, parseBytes } from '../codes/raw-bytes';
import type { Unit } from '../units';
import { type PidDefinition, PIDS } from './pid-table';

export type { Finding };

export type DecodePidResult =
  | { ok: true; pid: string; name: string; kind: 'measurement'; value: number; unit: Unit }
  | { ok: true; pid: string; name: string; kind: 'supported_pids'; value: string[]; unit: null }
  | { ok: false; findings: Finding[] };

export type ParsePidResult = { ok: true; pid: string } | { ok: false; findings: Finding[] };

/**
 * A PID as two upper-case hex digits. Text is read as hex ("0c", "0x0C", "C" → "0C"; "11" is PID 0x11); a number
 * is taken at its value (12 → "0C").
 */
export function parsePid(pid: string | number, path = 'pid'): ParsePidResult {
  let n: number | undefined;
  if (typeof pid === 'number') {
    n = Number.isInteger(pid) && pid >= 0 && pid <= 0xff ? pid : undefined;
  } else if (typeof pid === 'string') {
    const text = pid.trim().replace(/^0x/i, '');
    n = /^[0-9a-f]{1,2}$/i.test(text) ? parseInt(text, 16) : undefined;
  }
  if (n === undefined) {
    return {
      ok: false,
      findings: [{ code: 'scan.bad_pid', path, message: `PID ${JSON.stringify(pid)} is not a hex number 00–FF (e.g. "0C")` }],
    };
  }
  return { ok: true, pid: n.toString(16).toUpperCase().padStart(2, '0') };
}

/** The table entry for a PID, or undefined when the PID is malformed or not one this product decodes. */
export function pidDefinition(pid: string | number): PidDefinition | undefined {
  const parsed = parsePid(pid);
  return parsed.ok ? PIDS.get(parsed.pid) : undefined;
}

/**
 * Decodes the data bytes of a service $01 response for one PID (the bytes after the mode and PID echo), given as a
 * list of numbers or as hex text "1A F8".
 */
export function decodePid(
  pid: string | number,
  bytes: readonly number[] | string,
  paths: { pid?: string; bytes?: string } = {},
): DecodePidResult {
  const pidPath = paths.pid ?? 'pid';
  const bytesPath = paths.bytes ?? 'bytes';
  const parsedPid = parsePid(pid, pidPath);
  if (!parsedPid.ok) return parsedPid;
  const definition = PIDS.get(parsedPid.pid);
  if (!definition) {
    return {
      ok: false,
      findings: [
        {
          code: 'scan.unknown_pid',
          path: pidPath,
          message: `PID ${parsedPid.pid} is not decoded here; known PIDs: ${[...PIDS.keys()].join(', ')}`,
        },
      ],
    };
  }
  const parsedBytes = parseBytes(bytes, bytesPath);
  if (!parsedBytes.ok) return parsedBytes;
  if (parsedBytes.bytes.length !== definition.bytes) {
    return {
      ok: false,
      findings: [
        {
          code: 'scan.wrong_byte_count',
          path: bytesPath,
          message: `PID ${definition.pid} (${definition.name}) takes ${definition.bytes} data byte${definition.bytes === 1 ? '' : 's'}, got ${parsedBytes.bytes.length}`,
        },
      ],
    };
  }
  const decoded = definition.decode(parsedBytes.bytes);
  return { ok: true, pid: definition.pid, name: definition.name, ...decoded };
}
