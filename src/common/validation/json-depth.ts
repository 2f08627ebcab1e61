/**
 * JSON bodies are refused when nested deeper than any request of ours needs, before they are parsed: parsing and
 * then validating a value nested 50 000 levels deep is where the stack overflows. One scan of the raw bytes.
 */
export const MAX_JSON_BODY_DEPTH = 64;

/** True when the JSON text nests objects and arrays more than `max` levels deep (strings are skipped). */
export function jsonTextTooDeep(text: Uint8Array, max = MAX_JSON_BODY_DEPTH): boolean {
  let depth = 0;
  let inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i]!;
    if (inString) {
      if (c === 0x5c) i++; // backslash: skip the escaped byte
      else if (c === 0x22) inString = false;
    } else if (c === 0x22) inString = true;
    else if (c === 0x5b || c === 0x7b) {
      if (++depth > max) return true;
    } else if (c === 0x5d || c === 0x7d) depth--;
  }
  return false;
}

/** body-parser's `verify` hook: throws an error the body-error handler answers with a 400 naming the limit. */
export function refuseDeepJson(_req: unknown, _res: unknown, buf: Buffer): void {
  if (jsonTextTooDeep(buf)) throw Object.assign(new Error('JSON body nested too deep'), { status: 400, type: 'body.too_deep' });
}
