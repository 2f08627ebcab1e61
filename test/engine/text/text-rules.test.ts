// Text that misleads a reader: which characters names, one-line and multi-line fields refuse, and how kept ones
// are shown. Code points from The Unicode Standard (C0/C1 controls, UAX #9 explicit formatting characters).
import { describe, expect, it } from 'vitest';
import { showInvisible, textProblem, type TextKind } from '../../../src/engine/text';

describe('text rules', () => {
  it.each<[string, string, TextKind, string | undefined]>([
    ['a plain name', 'Ines Marlow', 'name', undefined],
    ['a name with accents', 'Zoë Ångström', 'name', undefined],
    ['a name with a C1 control U+0085 (next line)', 'Teo\u0085Brand', 'name', 'U+0085'],
    ['a name with a C1 control U+009B (control sequence introducer)', 'Teo\u009B31m', 'name', 'U+009B'],
    ['a name of only zero-width spaces (U+200B)', '\u200B\u200B\u200B', 'name', 'visible characters'],
    ['a name of only a Hangul filler (U+3164)', '\u3164', 'name', 'visible characters'],
    ['a name with the right-to-left override U+202E', 'Sam \u202EnosliW', 'name', 'U+202E'],
    ['a name with a first-strong isolate U+2068', 'Sam \u2068x\u2069', 'name', 'U+2068'],
    ['a name with a line break', 'Sam\nWilson', 'name', 'line break'],
    ['a one-line field with a tab', 'TP\tsensor', 'line', 'tab'],
    ['a one-line field with the line separator U+2028', 'TP\u2028sensor', 'line', 'U+2028'],
    ['a NUL in a multi-line field', 'Stalls\u0000', 'multiline', 'U+0000'],
    ['an escape (U+001B) in a multi-line field', 'Stalls \u001B[2J', 'multiline', 'U+001B'],
    ['line breaks and tabs in a multi-line field', 'Stalls at idle.\r\n\tWorse when hot.', 'multiline', undefined],
    ['a direction override kept in a multi-line field (shown as a mark)', 'Paid \u202E0001\u202C USD', 'multiline', undefined],
  ])('%s', (_what, text, kind, problem) => {
    const found = textProblem(text, kind);
    if (problem === undefined) expect(found).toBeUndefined();
    else expect(found).toContain(problem);
  });

  it('shows direction controls and zero-width characters as marks', () => {
    expect(showInvisible('Paid \u202E0001\u202C USD')).toBe('Paid ⟨U+202E⟩0001⟨U+202C⟩ USD');
    expect(showInvisible('a\u200Bb\u2066c\u2069')).toBe('a⟨U+200B⟩b⟨U+2066⟩c⟨U+2069⟩');
    expect(showInvisible('Ω 4.87 V, 10 MΩ')).toBe('Ω 4.87 V, 10 MΩ');
  });
});
