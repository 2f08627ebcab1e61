/**
 * Engine results → HTTP. The engine answers `{ ok: false, findings }` with its own paths (`points[1].kpa`); the API
 * reports findings with dotted paths from the request root, as zod does (`body.pressure.points.1.kpa`).
 */
import { InvalidInputException, underPath, type Finding } from '../../common/errors/domain.exception';

type EngineResult = { ok: true } | { ok: false; findings: Finding[] };

/**
 * Engine paths in the API's form: brackets become dots, and a leading segment may be renamed to the field that
 * carries it in the request (`{ coefficients: 'model' }`).
 */
export function apiFindings(prefix: string, findings: Finding[], rename: Record<string, string> = {}): Finding[] {
  const dotted = findings.map((f) => {
    const path = f.path.replace(/\[(\d+)\]/g, '.$1');
    const [head, ...rest] = path.split('.');
    const renamed = head !== undefined && Object.hasOwn(rename, head) ? [rename[head], ...rest].join('.') : path;
    return { ...f, path: renamed };
  });
  return underPath(prefix, dotted);
}

/** The successful engine result, or a 400 carrying its findings under `prefix`. */
export function orInvalid<R extends EngineResult>(result: R, prefix = 'body', rename: Record<string, string> = {}): Extract<R, { ok: true }> {
  if (!result.ok) throw new InvalidInputException(apiFindings(prefix, (result as { findings: Finding[] }).findings, rename));
  return result as Extract<R, { ok: true }>;
}
