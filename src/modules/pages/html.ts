/**
 * A small escaping `html` tagged template for the server-rendered pages. Every interpolated value is escaped
 * unless it is already `SafeHtml` (the result of another `html` template, or `raw()` of markup we wrote).
 * Arrays are joined; null, undefined and false render nothing.
 */

import { showInvisible } from '../../engine/text';

export class SafeHtml {
  constructor(readonly value: string) {}
  toString(): string {
    return this.value;
  }
}

const ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;', '`': '&#96;' };

/** Escapes text for an element body or a quoted attribute value. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"'`]/g, (c) => ESCAPES[c]!);
}

export type Renderable = SafeHtml | string | number | boolean | null | undefined | Renderable[];

function render(value: Renderable): string {
  if (value === null || value === undefined || value === false || value === true) return '';
  if (value instanceof SafeHtml) return value.value;
  if (Array.isArray(value)) return value.map(render).join('');
  // Direction controls and zero-width characters in stored text are shown as marks, never obeyed.
  return escapeHtml(showInvisible(String(value)));
}

export function html(strings: TemplateStringsArray, ...values: Renderable[]): SafeHtml {
  let out = strings[0]!;
  values.forEach((v, i) => {
    out += render(v) + strings[i + 1]!;
  });
  return new SafeHtml(out);
}

/** Markup written by us (icons, fixed fragments): never user input. */
export function raw(markup: string): SafeHtml {
  return new SafeHtml(markup);
}

/** JSON for a `data-*` attribute: escaped like any attribute value, parsed back with JSON.parse on the client. */
export function jsonAttr(value: unknown): string {
  return JSON.stringify(value);
}
