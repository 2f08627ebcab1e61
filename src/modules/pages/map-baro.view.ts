/**
 * On a MAP circuit, key on engine off: the scan tool's MAP (SAE J1979 PID 0B) against BARO (PID 33), the latest
 * diagnosis reading of each. The built-in three-wire tree models its sensor as a potentiometer, so this check is the
 * calculators' (src/engine/calc/pressure.ts), shown beside the circuit's readings rather than weighed by the tree.
 */
import { mapAgainstBaroKoeo } from '../../engine/calc';
import type { MeasurementRow } from '../measurements/measurements.repository';
import type { CircuitDiagnosis } from './bay.service';
import { html, type SafeHtml } from './html';
import { ICON } from './layout.view';

const kpaOf = (m: MeasurementRow) => (m.siUnit === 'Pa' ? (m.valueSi as number) / 1000 : m.siUnit === 'kPa' ? (m.valueSi as number) : undefined);

function latestKoeo(readings: readonly MeasurementRow[], pid: string): MeasurementRow | undefined {
  return readings
    .filter((m) => m.quantity === 'scan_value' && m.pid?.toUpperCase() === pid && m.key === 'on' && m.engine === 'off' && m.phase === 'diagnosis' && !m.supersededBy && kpaOf(m) !== undefined)
    .sort((a, b) => a.takenAt.getTime() - b.takenAt.getTime())
    .at(-1);
}

export function mapBaroPanel(c: CircuitDiagnosis): SafeHtml {
  if (c.context.sensor?.toUpperCase() !== 'MAP') return html``;
  const map = latestKoeo(c.readings, '0B');
  const baro = latestKoeo(c.readings, '33');
  if (!map || !baro) {
    return html`<section class="panel" aria-labelledby="mapbaro-h"><h2 id="mapbaro-h">MAP against BARO, key on engine off</h2>
      <p class="muted">Read MAP (PID 0B) and BARO (PID 33) on the scan tool, key on and engine off, in kPa: they should agree within a few kPa.${map ? ' MAP is read; BARO is still to take.' : baro ? ' BARO is read; MAP is still to take.' : ''}</p></section>`;
  }
  const check = mapAgainstBaroKoeo(kpaOf(map)!, kpaOf(baro)!);
  if (!check.ok) return html``;
  const { differenceKpa, verdict, finding } = check.value;
  return html`<section class="panel" aria-labelledby="mapbaro-h"><h2 id="mapbaro-h">MAP against BARO, key on engine off</h2>
    <dl class="conditions"><div class="condition"><dt>MAP, PID 0B</dt><dd>${kpaOf(map)!.toFixed(0)} kPa</dd></div>
      <div class="condition"><dt>BARO, PID 33</dt><dd>${kpaOf(baro)!.toFixed(0)} kPa</dd></div>
      <div class="condition"><dt>Difference</dt><dd>${differenceKpa > 0 ? '+' : ''}${differenceKpa.toFixed(0)} kPa</dd></div></dl>
    <p class="${verdict === 'agree' ? '' : 'notice'}">${verdict === 'agree' ? html`${ICON.check} They agree.` : html`${ICON.flag} ${finding!.message}`}</p></section>`;
}
