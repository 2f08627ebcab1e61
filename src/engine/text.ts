/**
 * Text that cannot mislead a reader. Names and one-line fields refuse control characters, text-direction
 * controls (which reorder what a reader sees: "Paid \u202E0001\u202C USD" displays as "Paid 1000 USD") and
 * values made only of invisible characters. Multi-line free text keeps line breaks and tabs and may keep
 * direction controls, which pages and the PDF then show as visible marks (⟨U+202E⟩). Every text is stored in
 * Unicode Normalization Form C (Unicode Standard Annex #15), so equal-looking text compares equal.
 */

export type TextKind = 'name' | 'line' | 'multiline';

/** Direction overrides and isolates (Unicode Standard Annex #9, explicit formatting characters) and marks. */
const DIRECTION_CONTROLS = /[\u202A-\u202E\u2066-\u2069\u200E\u200F\u061C]/;
/** Characters drawn as nothing: format characters, separators and the blank-looking fillers. */
const INVISIBLE = /[\p{Cf}\p{Z}\s\u034F\u115F\u1160\u17B4\u17B5\u180E\u2800\u3164\uFE00-\uFE0F\uFFA0]/gu;
/** What pages and the PDF show as a mark: direction controls and the zero-width characters that hide text. */
const SHOWN_AS_MARKS = /[\u202A-\u202E\u2066-\u2069\u200E\u200F\u061C\u200B\u2060-\u2064\uFEFF]/g;

const codePoint = (c: string) => `U+${c.codePointAt(0)!.toString(16).toUpperCase().padStart(4, '0')}`;

function firstMatch(text: string, pattern: RegExp): { char: string; at: number } | undefined {
  const m = new RegExp(pattern.source, pattern.flags.replace('g', '')).exec(text);
  return m ? { char: m[0], at: [...text.slice(0, m.index)].length + 1 } : undefined;
}

/** Why the text is refused for this kind of field (a message for a 400), or undefined when it is fine. */
export function textProblem(text: string, kind: TextKind): string | undefined {
  const control = firstMatch(text, kind === 'multiline' ? /[^\P{Cc}\t\n\r]/u : /\p{Cc}/u);
  if (control) {
    const lineBreak = control.char === '\n' || control.char === '\r' || control.char === '\t';
    return lineBreak
      ? `must be one line: found a ${control.char === '\t' ? 'tab' : 'line break'} at character ${control.at}`
      : `must not contain control characters: found ${codePoint(control.char)} at character ${control.at}`;
  }
  if (kind === 'multiline') return undefined;
  const direction = firstMatch(text, DIRECTION_CONTROLS);
  if (direction) return `must not contain text-direction controls, which change the order a reader sees: found ${codePoint(direction.char)} at character ${direction.at}`;
  const separator = firstMatch(text, /[\u2028\u2029]/);
  if (separator) return `must be one line: found the separator ${codePoint(separator.char)} at character ${separator.at}`;
  if (text !== '' && text.replace(INVISIBLE, '') === '') return 'must contain visible characters, not only spaces or invisible ones';
  return undefined;
}

/** The text with direction controls and zero-width characters shown as marks such as ⟨U+202E⟩. */
export function showInvisible(text: string): string {
  return text.replace(SHOWN_AS_MARKS, (c) => `⟨${codePoint(c)}⟩`);
}
