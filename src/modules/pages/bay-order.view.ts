/** One repair order at the bay: its circuits, adding one (or identifying the wires first), repairs, sign-off. */
import type { Actor } from '../identity/actor';
import type { CircuitDiagnosis, OrderDetail, OrderOverview, RepairItem, ReviewList } from './bay.service';
import { html, type SafeHtml } from './html';
import { ICON, page } from './layout.view';
import { cautionList, diagnosisStatus, orderHeader, proofLink, repairsList, reviewsList } from './parts.view';
import { unitsFor } from '../../engine/units';
import { percent } from './words';
import { approvalBanner, type Approval } from './approval.view';

const KIND_WORDS: Record<string, string> = {
  three_wire_5v: 'Three-wire 5 V sensor (reference, signal, ground)',
  two_wire_thermistor: 'Two-wire thermistor (signal, ground)',
  shared_5v_reference: 'One 5 V reference shared by several sensors',
};
const ROLES = ['reference', 'signal', 'ground', 'unknown'] as const;
/** The ohms units the reading pad offers, from the one definition of units. */
const OHMS_UNITS = unitsFor('ohms');
const ROLE_WORDS: Record<string, string> = { reference: '5 V reference', signal: 'Signal', ground: 'Sensor ground', unknown: 'Not known yet' };

export interface Prefill {
  kind?: string;
  cavities?: Array<[string, string]>;
}

function circuitCard(order: OrderDetail, c: CircuitDiagnosis): SafeHtml {
  // Once repaired, the card states the cause as diagnosed before the repair, like the proof does.
  const shown = c.atRepair ?? c.diagnosis;
  const top = shown.ranked[0];
  return html`<li class="circuit-card">
    <div><strong class="circuit-name">${c.circuit.label}</strong> <span class="muted">${c.circuit.sensor} · ${KIND_WORDS[c.circuit.kind] ?? c.circuit.kind}</span></div>
    <div>${diagnosisStatus(shown)} ${top ? html`${c.atRepair ? 'Cause found before the repair' : 'Leading cause'}: ${top.label} (${percent(top.probability)})` : ''}
      · ${c.readings.length} reading${c.readings.length === 1 ? '' : 's'}</div>
    <a class="button primary" href="/bay/orders/${order.id}/circuits/${c.circuit.id}">${order.status === 'repaired' ? 'Verify the repair' : 'Test this circuit'}</a>
  </li>`;
}

/** The order's shared 5 V references (which circuits) and the next test for the whole order. */
function sharedReferencePanel(order: OrderDetail, overview: OrderOverview | undefined): SafeHtml {
  if (!overview || (!overview.referenceGroups.length && !overview.nextTest)) return html``;
  const labelOf = (id: string) => overview.circuits.find((c) => c.circuitId === id)?.label ?? 'a circuit no longer on the order';
  const next = overview.nextTest;
  const top = overview.leadingCauses[0];
  return html`<section class="panel" id="order-view" aria-labelledby="order-view-h">
    <h2 id="order-view-h">The whole order</h2>
    ${overview.referenceGroups.map(
      (g) => html`<div class="shared-reference">
        <p><strong>One 5 V reference feeds:</strong> ${g.circuitIds.map(labelOf).join(', ')}</p>
        ${g.active
          ? html`<p>${diagnosisStatus(g.diagnosis, 'Shared reference')} Diagnosed as one: ${g.why.join('; ')}.${g.diagnosis.ranked[0] ? html` Leading cause: ${g.diagnosis.ranked[0].label} (${percent(g.diagnosis.ranked[0].probability)})` : ''}</p>`
          : html`<p class="muted">Each circuit is diagnosed on its own until two of them point at this reference.</p>`}
      </div>`,
    )}
    ${top ? html`<p>Leading cause across the order: ${top.label} (${percent(top.probability)})${top.circuitId ? html` · ${labelOf(top.circuitId)}` : ''}</p>` : ''}
    ${next
      ? html`<div class="next-for-order"><p><strong>Next test for the order:</strong> ${next.label} <span class="muted">at the ${labelOf(next.circuitId)} connector</span></p>
          ${cautionList(next.cautions)}
          <ol>${next.procedure.map((step) => html`<li>${step}</li>`)}</ol>
          ${next.referenceGroupId ? '' : html`<a class="button" href="/bay/orders/${order.id}/circuits/${next.circuitId}">Take it on ${labelOf(next.circuitId)}</a>`}</div>`
      : ''}
  </section>`;
}

function cavityRows(prefill: Prefill, kind: string): SafeHtml {
  const defaults: Array<[string, string]> = kind === 'two_wire_thermistor' ? [['1', 'unknown'], ['2', 'unknown']] : [['A', 'unknown'], ['B', 'unknown'], ['C', 'unknown']];
  const rows = prefill.cavities?.length ? prefill.cavities : defaults;
  return html`${rows.map(
    ([name, role], i) => html`<div class="row cavity-row">
      <div class="field narrow"><label for="cav-name-${i}">Cavity</label><input id="cav-name-${i}" name="cavity" value="${name}" maxlength="8" autocomplete="off"></div>
      <div class="field"><label for="cav-role-${i}">Wire</label><select id="cav-role-${i}" name="role">
        ${ROLES.map((r) => html`<option value="${r}" ${r === role ? 'selected' : ''}>${ROLE_WORDS[r]}</option>`)}
      </select></div>
    </div>`,
  )}`;
}

function addCircuitForm(order: OrderDetail, prefill: Prefill): SafeHtml {
  const kind = prefill.kind && KIND_WORDS[prefill.kind] ? prefill.kind : 'three_wire_5v';
  return html`<section class="panel" id="add-circuit" aria-labelledby="add-circuit-h">
    <h2 id="add-circuit-h">Add a circuit to test</h2>
    <p><a class="button" href="/bay/orders/${order.id}/wires">No diagram? Identify the wires first</a></p>
    <form id="circuit-form" class="form" data-order="${order.id}" novalidate>
      <fieldset class="field choice"><legend>Kind of circuit</legend>
        ${Object.entries(KIND_WORDS).map(
          ([k, words]) => html`<label class="choice-item"><input type="radio" name="kind" value="${k}" ${k === kind ? 'checked' : ''}> ${words}</label>`,
        )}
      </fieldset>
      <div class="row">
        <div class="field"><label for="sensor">Sensor (SAE J1930 term)</label><input id="sensor" name="sensor" list="sensor-terms" maxlength="64" required autocomplete="off">
          <datalist id="sensor-terms"><option value="TP"><option value="APP"><option value="MAP"><option value="FTP"><option value="ECT"><option value="IAT"></datalist></div>
        <div class="field"><label for="label">What you call it</label><input id="label" name="label" maxlength="80" required placeholder="e.g. TP sensor 1"></div>
      </div>
      <fieldset class="field"><legend>Connector cavities</legend><div class="cavity-list">${cavityRows(prefill, kind)}</div></fieldset>
      <p class="form-error" role="alert" hidden></p>
      <button class="button primary big" type="submit">Add the circuit and start testing</button>
    </form>
  </section>`;
}

export function orderPage(
  actor: Actor,
  data: { order: OrderDetail; circuits: CircuitDiagnosis[]; repairs: RepairItem[]; reviews: ReviewList; approval?: Approval; toMeasure?: Array<{ circuit: string; test: string; state: string }>; overview?: OrderOverview },
  prefill: Prefill,
): SafeHtml {
  const { order, circuits, repairs, reviews } = data;
  const toMeasure = data.toMeasure ?? [];
  const latest = reviews.latest;
  const finished = order.status === 'verified' || order.status === 'closed';
  const verifications = circuits.flatMap((c) => c.verification);
  const taken = verifications.filter((v) => v.after).length;
  return page(
    { title: order.number, actor, page: 'bay-order', scripts: ['order.js'], back: { href: '/bay', label: 'My repair orders' } },
    html`${orderHeader(order)}
    ${latest?.decision === 'returned' ? html`<p class="notice returned" role="note">${ICON.flag} <strong>Returned by ${latest.by.name}:</strong> ${latest.comment}</p>` : ''}
    ${approvalBanner(data.approval, order.status)}
    <section aria-labelledby="circuits-h">
      <h2 id="circuits-h">Circuits under test</h2>
      ${circuits.length ? html`<ul class="circuit-list">${circuits.map((c) => circuitCard(order, c))}</ul>` : html`<p class="empty">No circuit yet: add the one the trouble code points at.</p>`}
    </section>
    ${sharedReferencePanel(order, data.overview)}
    ${finished ? '' : addCircuitForm(order, prefill)}
    <section class="panel" aria-labelledby="repairs-h"><h2 id="repairs-h">Repairs</h2>${repairsList(repairs)}</section>
    ${
      order.status === 'repaired'
        ? html`<section class="panel" aria-labelledby="verify-h"><h2 id="verify-h">Verification</h2>
          <p>${taken} of ${verifications.length} readings taken again after the repair.</p>
          ${toMeasure.length
            ? html`<p>Still to take again, and read healthy, before the repair counts as verified:</p>
              <ul>${toMeasure.map((t) => html`<li>${t.circuit}: ${t.test}${t.state === 'outside_healthy' ? ' (its latest reading still shows the fault)' : ''}</li>`)}</ul>`
            : ''}
          <form id="verified-form" data-order="${order.id}" data-version="${order.version}">
            <p class="form-error" role="alert" hidden></p>
            <button class="button primary big" type="submit" ${toMeasure.length ? 'disabled' : ''}>Mark the repair verified</button>
          </form></section>`
        : ''
    }
    <section class="panel" aria-labelledby="reviews-h"><h2 id="reviews-h">Foreman decisions</h2>${reviewsList(reviews)}</section>
    <p>${proofLink(order)}</p>`,
  );
}

export function wiresPage(actor: Actor, order: OrderDetail): SafeHtml {
  const row = (name: string, i: number) => html`<div class="row cavity-reading" data-row>
    <div class="field narrow"><label for="w-cav-${i}">Cavity</label><input id="w-cav-${i}" name="cavity" value="${name}" maxlength="8" autocomplete="off"></div>
    <div class="field"><label for="w-volts-${i}">Volts, key on (V)</label><input id="w-volts-${i}" name="volts" inputmode="decimal" autocomplete="off"></div>
    <div class="field"><label for="w-ohms-${i}">Ohms, key off</label><input id="w-ohms-${i}" name="ohms" inputmode="decimal" autocomplete="off"></div>
    <div class="field narrow"><label for="w-ohms-unit-${i}">Unit</label><select id="w-ohms-unit-${i}" name="ohmsUnit">${OHMS_UNITS.map((u) => html`<option value="${u}">${u}</option>`)}</select></div>
    <label class="check"><input type="checkbox" name="open"> Meter shows OL</label>
  </div>`;
  return page(
    { title: `Identify wires · ${order.number}`, actor, page: 'bay-wires', scripts: ['wires.js'], back: { href: `/bay/orders/${order.id}`, label: order.number } },
    html`<h1>Which wire is which?</h1>
    <p class="lead">Unplug the sensor. For each cavity of the harness side, read volts to battery negative with the key on, then ohms to battery negative with the key off.</p>
    <section class="cautions" aria-label="Cautions">
      <p class="caution">${ICON.caution}<strong>Caution:</strong> <span>Turn the key off before unplugging or plugging a connector.</span></p>
      <p class="caution">${ICON.caution}<strong>Caution:</strong> <span>Ohms checks only with the key off; never use an ohmmeter on airbag (supplemental restraint) circuits.</span></p>
      <p class="caution">${ICON.caution}<strong>Caution:</strong> <span>Probe the terminals without spreading them. Follow the manufacturer's service information where it differs.</span></p>
    </section>
    <form id="wires-form" class="form" data-order="${order.id}" novalidate>
      <fieldset class="field segmented"><legend>Kind of circuit</legend>
        <label><input type="radio" name="circuitKind" value="three_wire_5v" checked> Three-wire 5 V</label>
        <label><input type="radio" name="circuitKind" value="two_wire_thermistor"> Two-wire thermistor</label>
      </fieldset>
      <div id="wire-rows">${['A', 'B', 'C'].map(row)}</div>
      <p><button class="button" type="button" id="add-row">Add a cavity</button></p>
      <p class="form-error" role="alert" hidden></p>
      <button class="button primary big" type="submit">Propose the roles</button>
    </form>
    <section id="wires-result" class="panel" aria-live="polite" hidden></section>`,
  );
}
