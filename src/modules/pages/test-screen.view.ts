/** The test screen: what to measure next and how, the number pad, the causes, and the path so far. */
import { cautionsInContext, type NextTest } from '../../engine/diagnosis';
import type { Actor } from '../identity/actor';
import { CIRCUIT_PARTS } from '../repairs/repairs.dto';
import type { CircuitDiagnosis, Entry, OrderDetail } from './bay.service';
import { html, jsonAttr, type SafeHtml } from './html';
import { ICON, page } from './layout.view';
import { cautionList, conclusionCard, diagnosisStatus, pathList, proofLink, rankedCauses, statusTag } from './parts.view';
import { requestKey } from '../../engine/diagnosis';
import { sensorInputWords } from '../../engine/vocabulary';
import { conditions, formatEntered, leads, PART_WORDS, padUnits, percent, predictedRange } from './words';
import { repairable } from './diagnosis-state';
import { codesWeighedPanel, returnedCodesNotice } from './codes.view';
import { temperaturePanel, type TemperatureInput } from './temperatures.view';
import { mapBaroPanel } from './map-baro.view';

const REASON_WORDS: Record<string, string> = {
  recheck_indeterminate: 'The last reading fell between two outcomes. Check the probe points and the connector, then measure again.',
  recheck_contradiction: 'The readings together do not fit any cause. This one is the most likely to be wrong: take it again.',
  crank_and_reread: 'The scan value did not change with the engine stopped. Some modules refresh only with engine speed: crank and read again.',
};
const MODE_HEADINGS: Record<Entry['mode'], string> = { next: 'Next test', recheck: 'Measure again', correct: 'Correct a reading', verify: 'After the repair' };

/** The one caution every test carries: shown as a compact line, so the specific ones and the leads stay in view. */
const GENERAL_CAUTIONS = new Set(['service_information']);

function instructions(entry: Entry, c: CircuitDiagnosis, next: NextTest | null): SafeHtml {
  const l = leads(entry.request, c.circuit.cavities);
  const scan = entry.request.quantity === 'scan_value';
  const input = sensorInputWords(entry.request);
  const useNext = next && entry.mode !== 'correct' && entry.mode !== 'verify' ? next : null;
  // Corrections and verification readings repeat a test of the tree: show its own steps and cautions.
  const known = useNext ?? c.howTo.get(requestKey(entry.request)) ?? null;
  const cautions = cautionsInContext(known?.cautions ?? [], entry.request, c.context);
  const specific = cautions.filter((x) => !GENERAL_CAUTIONS.has(x.id));
  const general = cautions.filter((x) => GENERAL_CAUTIONS.has(x.id));
  return html`${useNext && REASON_WORDS[useNext.reason] ? html`<p class="notice">${ICON.flag} ${REASON_WORDS[useNext.reason]}</p>` : ''}
    ${known?.preconditions.length ? html`<div class="before-start"><h3>Before you start</h3><ul>${known.preconditions.map((p) => html`<li>${p}</li>`)}</ul></div>` : ''}
    ${cautionList(specific)}
    <div class="leads">
      <p class="lead-line"><span class="lead-tag ${scan ? 'lead-scan' : 'lead-red'}">${scan ? 'Scan tool' : 'Red lead'}</span> ${l.red}</p>
      ${l.black ? html`<p class="lead-line"><span class="lead-tag lead-black">Black lead</span> ${l.black}</p>` : ''}
      ${
        entry.request.location === 'sensor_pins' && !scan
          ? html`<p class="notice lead-where lead-on-sensor">${ICON.flag} ${l.where}</p>`
          : html`<p class="muted lead-where">${l.where}</p>`
      }
      ${input ? html`<p class="lead-line input-moved"><strong>${input.replace(/^./, (ch) => ch.toUpperCase())}</strong> while you read.</p>` : ''}
    </div>
    <dl class="conditions">${conditions(entry.request).map((x) => html`<div class="condition"><dt>${x.label}</dt><dd>${x.value}</dd></div>`)}</dl>
    ${general.map((g) => html`<p class="caution-general">${ICON.caution} ${g.text}</p>`)}
    ${
      useNext?.setups.length
        ? html`<div class="setups"><h3>First</h3>${useNext.setups.map((s) => html`<p><strong>${s.label}</strong></p><ol>${s.steps.map((st) => html`<li>${st}</li>`)}</ol>`)}</div>`
        : ''
    }
    ${known ? html`<h3>How</h3><ol class="procedure">${known.procedure.map((p) => html`<li>${p}</li>`)}</ol>` : ''}
    ${useNext?.comparison ? comparisonTable(useNext, entry, c) : ''}
    ${useNext ? expectations(useNext, entry) : ''}`;
}

/** A comparison: both readings (the lead or PID of each, the value if taken), their difference and what it means. */
function comparisonTable(next: NextTest, entry: Entry, c: CircuitDiagnosis): SafeHtml {
  const cmp = next.comparison!;
  const now = requestKey(entry.request);
  const value = (x: number | null) => (x === null ? null : `${Number(x.toFixed(cmp.unit === '°C' ? 0 : 3))} ${cmp.unit}`);
  const row = (which: string, half: typeof cmp.first) => html`<tr class="${requestKey(half.request) === now ? 'half-now' : ''}">
      <th scope="row">${which}</th><td>${half.label}<br><span class="muted">${leads(half.request, c.circuit.cavities).red}</span></td>
      <td>${value(half.value) ?? (requestKey(half.request) === now ? html`<strong>take it now</strong>` : html`<span class="muted">not yet taken</span>`)}</td></tr>`;
  const difference = cmp.first.value !== null && cmp.second.value !== null ? cmp.first.value - cmp.second.value : null;
  return html`<h3>Two readings, one result</h3>
    <p class="muted">Enter each reading on its own; the difference, first less second, decides the outcome.</p>
    <table class="table comparison"><thead><tr><th scope="col"></th><th scope="col">Reading (lead or PID)</th><th scope="col">Value</th></tr></thead>
    <tbody>${row('First', cmp.first)}${row('Second', cmp.second)}
      <tr><th scope="row">Difference</th><td>first − second</td><td>${value(difference) ?? html`<span class="muted">once both are taken</span>`}</td></tr></tbody></table>
    <ul class="comparison-outcomes">${next.outcomes.map((o) => html`<li>${o.label}${o.range ? html` <span class="muted">(${rangeWords(o.range, cmp.unit)})</span>` : ''}</li>`)}</ul>`;
}

const rangeWords = ([lo, hi]: [number, number], unit: string) =>
  lo <= -20 && unit === 'V' ? `below ${hi} ${unit}` : lo <= -255 ? `below ${hi} ${unit}` : hi >= 20 && unit === 'V' ? `above ${lo} ${unit}` : hi >= 255 ? `above ${lo} ${unit}` : `${lo} to ${hi} ${unit}`;

/** Comparisons counted or waiting: both readings, which lead or PID each is, the difference and its outcome. */
function comparisonsPanel(d: CircuitDiagnosis['diagnosis']): SafeHtml {
  const shown = d.comparisons.filter((x) => x.first.readingId !== null || x.second.readingId !== null);
  if (!shown.length) return html``;
  const value = (x: number | null, unit: string) => (x === null ? '—' : `${Number(x.toFixed(unit === '°C' ? 0 : 3))} ${unit}`);
  return html`<section class="panel" aria-labelledby="cmp-h"><h2 id="cmp-h">Comparisons</h2>
    <ul class="comparisons">${shown.map(
      (x) => html`<li class="comparison verdict-${x.verdict}"><strong>${x.testLabel}</strong>
        <dl class="conditions"><div class="condition"><dt>${x.first.label}</dt><dd>${value(x.first.value, x.unit)}</dd></div>
          <div class="condition"><dt>${x.second.label}</dt><dd>${value(x.second.value, x.unit)}</dd></div>
          <div class="condition"><dt>Difference</dt><dd>${x.difference === null ? '—' : `${x.difference > 0 ? '+' : ''}${value(x.difference, x.unit)}`}</dd></div></dl>
        <p>${x.outcomeLabel ? html`Outcome: <strong>${x.outcomeLabel}</strong>` : html`<span class="muted">${x.note}</span>`}</p></li>`,
    )}</ul></section>`;
}

/** The predicted difference of a comparison, first less second, signed, in its unit. */
function differenceRange(band: NextTest['predictions'][number]['band'], unit: string): string | null {
  if (!band || band.p5 === 'overload' || band.p95 === 'overload') return null;
  const signed = (x: number) => `${x > 0 ? '+' : x < 0 ? '−' : ''}${Number(Math.abs(x).toFixed(unit === '°C' ? 0 : 3))} ${unit}`;
  return `${signed(band.p5)} to ${signed(band.p95)} (first less second)`;
}

function expectations(next: NextTest, entry: Entry): SafeHtml {
  const scan = entry.request.quantity === 'scan_value';
  const outcome = (id: string) => next.outcomes.find((o) => o.id === id)?.label ?? id;
  return html`<h3>What each likely cause would make the ${scan ? 'scan tool' : 'meter'} show</h3>
    <table class="table expect"><thead><tr><th scope="col">If it is</th><th scope="col">Most likely</th><th scope="col">Could read (9 in 10 times)</th></tr></thead>
    <tbody>${next.predictions.map((p) => {
      const range = next.comparison ? differenceRange(p.band, next.comparison.unit) : predictedRange(p.band, entry.request.quantity);
      return html`<tr><th scope="row">${p.label} <span class="muted">(${percent(p.probability)})</span></th>
        <td>${outcome(p.likelyOutcome)}</td><td>${range ?? html`<span class="muted">no range modelled</span>`}</td></tr>`;
    })}</tbody></table>`;
}

function pad(order: OrderDetail, c: CircuitDiagnosis, entry: Entry): SafeHtml {
  // A half of a comparison in °C (two temperature PIDs) offers °C first.
  const preferred = entry.mode === 'next' ? c.diagnosis.nextTest?.comparison?.unit : undefined;
  const all = padUnits(entry.request.quantity);
  const units = preferred && all.includes(preferred) ? [preferred, ...all.filter((u) => u !== preferred)] : all;
  const keys = ['7', '8', '9', '4', '5', '6', '1', '2', '3', '−', '0', '.'];
  const ol = entry.request.quantity !== 'scan_value';
  return html`<form id="reading-form" class="pad-form" novalidate data-order="${order.id}" data-circuit="${c.circuit.id}"
      data-entry="${jsonAttr({ request: entry.request, phase: entry.phase, supersedes: entry.supersedes ?? null, mode: entry.mode, title: entry.title })}">
    <div class="pad-display">
      <label for="reading-value">Reading</label>
      <input id="reading-value" name="value" inputmode="decimal" autocomplete="off" spellcheck="false" aria-describedby="reading-help">
      <p id="reading-help" class="field-state" aria-live="polite">Type or tap the value the meter shows${ol ? ', or OL for over-range' : ''}.</p>
    </div>
    <fieldset class="units"><legend>Unit</legend>
      ${units.map((u, i) => html`<label class="unit"><input type="radio" name="unit" value="${u}" ${i === 0 ? 'checked' : ''}><span>${u}</span></label>`)}
    </fieldset>
    <div class="pad" role="group" aria-label="Number pad">
      ${keys.map((k) => html`<button type="button" class="key" data-key="${k === '−' ? '-' : k}" aria-label="${k === '−' ? 'minus' : k === '.' ? 'decimal point' : k}">${k}</button>`)}
      ${ol ? html`<button type="button" class="key key-wide" data-key="OL" aria-label="over-range, OL">OL</button>` : ''}
      <button type="button" class="key key-wide" data-key="back" aria-label="delete last digit">⌫ Delete</button>
      <button type="button" class="key key-wide" data-key="clear" aria-label="clear the reading">Clear</button>
    </div>
    <div class="field"><label for="reading-note">Note (optional)</label><input id="reading-note" name="note" maxlength="2000" autocomplete="off"></div>
    <p class="form-error" role="alert" hidden></p>
    <button class="button primary big" type="submit">Save reading</button>
  </form>`;
}

/** Offered only once a cause that needs repairing is proven; "What you did" is the technician's own words. */
function repairForm(order: OrderDetail, c: CircuitDiagnosis): SafeHtml {
  if (!repairable(c.diagnosis)) return html``;
  const conclusion = c.diagnosis.conclusion!;
  const part = (CIRCUIT_PARTS as readonly string[]).includes(conclusion.repair.part) ? conclusion.repair.part : 'other';
  return html`<details class="panel" id="repair" open>
    <summary><h2>Record the repair</h2></summary>
    <form id="repair-form" class="form" data-order="${order.id}" data-circuit="${c.circuit.id}" novalidate>
      <div class="field"><label for="repair-part">Part of the circuit repaired</label><select id="repair-part" name="part">
        ${CIRCUIT_PARTS.map((p) => html`<option value="${p}" ${p === part ? 'selected' : ''}>${PART_WORDS[p] ?? p}</option>`)}</select></div>
      <div class="field"><label for="repair-action">What you did</label>
        <textarea id="repair-action" name="action" rows="2" required maxlength="500" aria-describedby="repair-action-hint" placeholder="${conclusion.repair.action}"></textarea>
        <p id="repair-action-hint" class="muted">In your own words. Suggested: ${conclusion.repair.action}</p></div>
      <div class="field"><label for="repair-location">Where on the circuit</label><input id="repair-location" name="location" maxlength="300" placeholder="e.g. signal wire 15 cm from the sensor connector"></div>
      <fieldset class="field"><legend>Parts used</legend><div id="parts-rows">
        <div class="row part-row"><div class="field"><label for="part-name-0">Part</label><input id="part-name-0" name="partName" maxlength="120"></div>
        <div class="field"><label for="part-number-0">Part number</label><input id="part-number-0" name="partNumber" maxlength="60"></div>
        <div class="field narrow"><label for="part-qty-0">Qty</label><input id="part-qty-0" name="partQty" inputmode="numeric" value="1"></div></div>
      </div><button type="button" class="button" id="add-part">Add a part</button></fieldset>
      <div class="field"><label for="repair-note">Note</label><input id="repair-note" name="note" maxlength="2000"></div>
      <p class="form-error" role="alert" hidden></p>
      <button class="button primary big" type="submit">Save the repair</button>
    </form>
  </details>`;
}

function verificationPanel(order: OrderDetail, c: CircuitDiagnosis, entry: Entry | null): SafeHtml {
  const items = c.verification;
  const done = items.filter((v) => v.after).length;
  return html`<section class="panel" aria-labelledby="verify-h"><h2 id="verify-h">Prove the repair: ${done} of ${items.length} taken again</h2>
    ${returnedCodesNotice(order.codesAfter, c.circuit)}
    <ul class="verify-list">${items.map(
      (v) => html`<li class="${v.after ? 'done' : 'todo'}">
        <span>${v.after ? ICON.check : ICON.pending} ${v.label}</span>
        <span class="muted">before ${formatEntered(v.before.valueEntered, v.before.unitEntered, v.before.overload)}${v.after ? `, after ${formatEntered(v.after.valueEntered, v.after.unitEntered, v.after.overload)}` : ''}</span>
        ${entry?.mode === 'verify' && entry.index === v.index ? html`<span class="pill">measuring now</span>` : html`<a class="button small" href="?verify=${v.index}">${v.after ? 'Take again' : 'Measure'}</a>`}
      </li>`,
    )}</ul>
    <form id="verified-form" data-order="${order.id}" data-version="${order.version}">
      <p class="form-error" role="alert" hidden></p>
      <button class="button primary big" type="submit" ${done === 0 ? 'disabled' : ''}>Mark the repair verified</button>
    </form>
  </section>`;
}

export function testScreenPage(actor: Actor, order: OrderDetail, c: CircuitDiagnosis, entry: Entry | null, temperatures: TemperatureInput = { errors: [] }): SafeHtml {
  const d = c.diagnosis;
  const base = `/bay/orders/${order.id}/circuits/${c.circuit.id}`;
  const correctable = order.status === 'repaired' ? 'verification' : order.status === 'open' || order.status === 'diagnosing' ? 'diagnosis' : null;
  return page(
    { title: `${c.circuit.label} · ${order.number}`, actor, page: 'bay-test', scripts: ['test-screen.js'], back: { href: `/bay/orders/${order.id}`, label: order.number } },
    html`<header class="test-head">
      <h1>${c.circuit.label} <span class="muted">${order.number}</span></h1>
      <p>${statusTag(order.status)} ${diagnosisStatus(c.atRepair ?? d)} <span class="muted">${d.tree.title}</span></p>
    </header>
    <section id="unsent" class="unsent" aria-live="polite" hidden></section>
    <div class="test-grid" data-region="work">
      <div class="test-main">
        ${
          entry
            ? html`<section class="panel entry" aria-labelledby="entry-h">
                <p class="kicker">${MODE_HEADINGS[entry.mode]}${entry.request.quantity === 'scan_value' ? ' · scan-tool test' : ''}</p>
                <h2 id="entry-h" tabindex="-1">${entry.mode === 'verify' ? entry.title.replace(/^After the repair: /, '') : entry.title}</h2>
                ${entry.mode === 'correct' ? html`<p class="notice correcting">${ICON.flag} <span>Correcting <strong>${entry.title}</strong>: the reading on record is <strong>${entry.was ?? ''}</strong>. The new reading replaces it in the diagnosis; the old one stays on record, marked corrected. <a href="${base}">Cancel</a></span></p>` : ''}
                <div class="entry-body"><div class="entry-info">${instructions(entry, c, d.nextTest)}</div>
                <div class="entry-pad">${pad(order, c, entry)}</div></div>
              </section>`
            : ''
        }
        ${order.status === 'open' || order.status === 'diagnosing' ? html`${conclusionCard(d)}${repairForm(order, c)}` : ''}
        ${order.status === 'repaired' ? verificationPanel(order, c, entry) : ''}
        ${order.status === 'verified' || order.status === 'closed' ? html`<section class="panel"><h2>${ICON.check} Repair verified</h2><p>The foreman reviews it next.</p><p>${proofLink(order)}</p></section>` : ''}
      </div>
      <div class="test-side">
        <section class="panel" aria-labelledby="causes-h"><h2 id="causes-h">${c.atRepair ? 'Causes as diagnosed before the repair' : 'Likely causes'}</h2>${rankedCauses(c.atRepair ?? d)}</section>
        ${codesWeighedPanel(c.atRepair ?? d)}
        ${temperaturePanel(c, temperatures)}
        ${comparisonsPanel(d)}
        ${mapBaroPanel(c)}
        <section class="panel" aria-labelledby="path-h"><h2 id="path-h">Readings so far</h2>${pathList(c, (r) => (r.phase === correctable ? `${base}?correct=${r.id}` : undefined))}</section>
      </div>
    </div>`,
  );
}
