/** The order's trouble codes on the test screen: which ones weighed the causes of this circuit, and how. */
import { codeMayConcern, codeRow } from '../../engine/codes';
import type { Diagnosis } from '../../engine/diagnosis';
import { html, type SafeHtml } from './html';
import { ICON } from './layout.view';

const sentence = (s: string) => s.charAt(0).toUpperCase() + s.slice(1) + (/[.!?]$/.test(s) ? '' : '.');

/** Weighed codes first, each with the window it was read as and its effect on the causes; the others, set aside, after. */
export function codesWeighedPanel(d: Pick<Diagnosis, 'codesWeighed'>): SafeHtml {
  const codes = d.codesWeighed ?? [];
  if (codes.length === 0) return html``;
  const weighed = codes.filter((c) => c.weighed);
  const aside = codes.filter((c) => !c.weighed);
  return html`<section class="panel" aria-labelledby="codes-h"><h2 id="codes-h">Trouble codes</h2>
    <p class="muted">${weighed.length ? 'Codes about this sensor weigh the causes before any reading.' : 'No code on this order weighs the causes of this circuit.'}</p>
    <ul class="codes-weighed">
      ${weighed.map(
        (c) => html`<li class="code-weighed">
          <p><span class="code">${c.code}</span> ${c.meaning}</p>
          ${c.window ? html`<p class="muted">Read as: ${c.window}.</p>` : ''}
          <p>${sentence(c.effect.replace(/^raises/, 'it makes likelier:').replace(/; lowers/, '. Less likely:').replace(/^lowers/, 'less likely:'))}</p>
        </li>`,
      )}
      ${aside.map((c) => html`<li class="code-aside"><p><span class="code">${c.code}</span> <span class="muted">${sentence(c.effect)}</span></p></li>`)}
    </ul>
  </section>`;
}

/** After the repair: codes read again that may concern this circuit keep the order from verified; say so up front. */
export function returnedCodesNotice(codesAfter: readonly string[], circuit: { sensor: string; kind: string }): SafeHtml {
  const back = codesAfter.filter((code) => {
    const row = codeRow(code);
    return row && codeMayConcern(row, circuit.sensor, circuit.kind);
  });
  if (back.length === 0) return html``;
  return html`<p class="notice">${ICON.flag} <span>Read again after the repair: ${back.map((c) => html`<span class="code">${c}</span> `)}${back.length === 1 ? 'concerns' : 'concern'} this circuit. The repair cannot be marked verified until the codes are cleared and read again with none of them back.</span></p>`;
}
