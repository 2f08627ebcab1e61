/** Pieces shared by the bay and the board: order header, ranked causes, the path so far, cautions, repairs, reviews. */
import type { Caution, Diagnosis } from '../../engine/diagnosis';
import type { MeasurementRow } from '../measurements/measurements.repository';
import { requestOf } from '../measurements/measurements.view';
import type { CircuitDiagnosis, OrderDetail, RepairItem, ReviewList } from './bay.service';
import { html, type SafeHtml } from './html';
import { isProven, repairable, undecidedOf } from './diagnosis-state';
import { ICON } from './layout.view';
import { DIAGNOSIS_STATUS_WORDS, formatEntered, PART_WORDS, percent, requestLine, STATUS_WORDS, VERDICT_WORDS, when } from './words';

/** The repair order's status, labelled as such: it sits beside the circuit's own badge on several screens. */
export function statusTag(status: string): SafeHtml {
  return html`<span class="tag tag-${status}"><span class="tag-what">Order</span> ${STATUS_WORDS[status] ?? status}</span>`;
}

export function vehicleLine(v: { year: number; make: string; model: string; engine?: string }): string {
  return `${v.year} ${v.make} ${v.model}${v.engine ? `, ${v.engine}` : ''}`;
}

export function orderHeader(order: OrderDetail): SafeHtml {
  return html`<header class="order-head">
    <h1><span class="ro-number">${order.number}</span> ${statusTag(order.status)}</h1>
    <p class="vehicle">${vehicleLine(order.vehicle)} · <span class="vin">${order.vehicle.vin}</span></p>
    <p class="complaint"><strong>Complaint:</strong> ${order.complaint}</p>
    ${order.codes.length ? html`<p class="codes"><strong>Codes:</strong> ${order.codes.map((c) => html`<span class="code">${c}</span> `)}</p>` : ''}
    <p class="meta">Technician: ${order.technician?.name ?? 'not assigned'} · opened ${when(order.dates.opened)}</p>
  </header>`;
}

export function cautionList(cautions: Caution[]): SafeHtml {
  if (cautions.length === 0) return html``;
  return html`<section class="cautions" aria-label="Cautions">
    ${cautions.map((c) => html`<p class="caution">${ICON.caution}<strong>Caution:</strong> <span>${c.text}</span></p>`)}
  </section>`;
}

export function rankedCauses(d: Diagnosis, limit = 5): SafeHtml {
  const rows = d.ranked.slice(0, limit);
  return html`<ol class="causes" aria-label="Likely causes, most likely first">
    ${rows.map(
      (r) => html`<li class="cause">
        <span class="cause-label">${r.label}</span>
        <span class="cause-part">${PART_WORDS[r.part] ?? r.part}</span>
        <span class="meter-bar" aria-hidden="true"><span style="width:${Math.max(1, Math.round(r.probability * 100))}%"></span></span>
        <span class="cause-p">${percent(r.probability)}</span>
      </li>`,
    )}
  </ol>`;
}

function readingValue(r: MeasurementRow): string {
  return formatEntered(r.valueEntered, r.unitEntered, r.overload);
}

/**
 * Every reading of the circuit in the order taken, corrected ones kept and marked. `correctHref` gives the link
 * for correcting a standing reading (absent on the board).
 */
export function pathList(c: CircuitDiagnosis, correctHref?: (reading: MeasurementRow) => string | undefined): SafeHtml {
  const byId = new Map(c.diagnosis.path.map((p) => [p.readingId, p]));
  const before = new Map((c.atRepair?.path ?? []).map((p) => [p.readingId, p]));
  if (c.readings.length === 0) return html`<p class="empty">No readings yet.</p>`;
  return html`<ol class="path">
    ${c.readings.map((r, i) => {
      const live = byId.get(r.id);
      // A reading set aside by the repair of its part: show what it meant when it was counted.
      const p = live?.verdict === 'before_repair' ? (before.get(r.id) ?? live) : live;
      const verdict = r.supersededBy ? 'superseded' : (p?.verdict ?? 'counted');
      const verdictWords = live?.verdict === 'before_repair' && p?.verdict === 'counted' ? 'counted in the diagnosis, before the repair' : (VERDICT_WORDS[verdict] ?? verdict);
      const fix = !r.supersededBy && correctHref ? correctHref(r) : undefined;
      return html`<li class="step verdict-${verdict}" data-reading-id="${r.id}">
        <div class="step-head">
          <span class="step-no">${i + 1}</span>
          <span class="step-label">${p?.testLabel ?? requestLine(requestOf(r), c.circuit.cavities)}</span>
          <span class="step-value">${readingValue(r)}</span>
        </div>
        <div class="step-detail">
          ${r.phase === 'verification' ? html`<span class="pill">${ICON.check} after repair</span>` : ''}
          ${p?.outcomeLabel ? html`<span>Outcome: ${p.outcomeLabel}</span>` : ''}
          ${verdict === 'verification' ? '' : html`<span>${verdictWords}</span>`}
          <span>${r.takenBy.name}, ${when(r.takenAt)}</span>
          ${r.supersededBy ? html`<span class="corrected">${ICON.cross} corrected by ${r.supersededBy.takenBy.name}, ${when(r.supersededBy.takenAt)}</span>` : ''}
        </div>
        ${r.note ? html`<p class="step-note">Note: ${r.note}</p>` : ''}
        ${fix ? html`<a class="button small ghost" href="${fix}">Correct this reading</a>` : ''}
      </li>`;
    })}
  </ol>`;
}

/** What is known: the proven cause and its repair, advice when nothing needs repairing, or "not proven". */
export function conclusionCard(d: Diagnosis): SafeHtml {
  const undecided = undecidedOf(d);
  if (undecided) {
    return html`<section class="panel conclusion not-proven" aria-labelledby="conclusion-h">
      <h2 id="conclusion-h">${ICON.flag} Not proven: no test left can settle it</h2>
      <p>The readings so far point most to:</p>
      <ul class="plain-list">${undecided.leading.map((l) => html`<li><strong>${l.label}</strong> <span class="pct">${percent(l.probability)}</span></li>`)}</ul>
      <p><strong>What to do:</strong> ${undecided.advice}</p>
      <p class="muted">No repair is offered until a cause is proven.</p>
    </section>`;
  }
  if (!isProven(d)) return html``;
  const c = d.conclusion!;
  return html`<section class="panel conclusion" aria-labelledby="conclusion-h">
    <h2 id="conclusion-h">${ICON.flag} Cause found</h2>
    <p class="big">${c.label} <span class="pct">${percent(c.probability)}</span></p>
    ${
      repairable(d)
        ? html`<p><strong>Repair:</strong> ${c.repair.action} <span class="muted">(part: ${PART_WORDS[c.repair.part] ?? c.repair.part})</span></p>`
        : html`<p><strong>Nothing to repair now:</strong> ${c.repair.action}</p>`
    }
  </section>`;
}

export function repairsList(repairs: RepairItem[]): SafeHtml {
  if (repairs.length === 0) return html`<p class="empty">No repair recorded yet.</p>`;
  return html`<ul class="plain-list">${repairs.map(
    (r) => html`<li><strong>${r.action}</strong> <span class="muted">(${PART_WORDS[r.part] ?? r.part}${r.location ? `, ${r.location}` : ''})</span>
      ${r.parts.length ? html`<br>Parts: ${r.parts.map((p) => `${p.quantity} × ${p.name}${p.number ? ` (${p.number})` : ''}`).join('; ')}` : ''}
      ${r.note ? html`<br>Note: ${r.note}` : ''}
      <br><span class="muted">${r.by.name}, ${when(r.at)}</span></li>`,
  )}</ul>`;
}

const DECISION_WORDS: Record<string, string> = { approved: 'Approved', returned: 'Returned to the technician', withdrawn: 'Approval withdrawn' };

export function reviewsList(reviews: ReviewList): SafeHtml {
  if (reviews.items.length === 0) return html`<p class="empty">No foreman decision yet.</p>`;
  return html`<ul class="plain-list">${reviews.items.map(
    (r) => html`<li class="review review-${r.decision}">${r.decision === 'approved' ? ICON.check : ICON.flag}
      <strong>${DECISION_WORDS[r.decision] ?? r.decision}</strong> by ${r.by.name}, ${when(r.at)}${r.comment ? html`<br>“${r.comment}”` : ''}</li>`,
  )}</ul>`;
}

/** The diagnosis state as a tag; `what` names what is diagnosed (one circuit, or a reference several share). */
export function diagnosisStatus(d: Diagnosis, what = 'Circuit'): SafeHtml {
  const state = d.status === 'concluded' && !isProven(d) ? 'exhausted' : d.status;
  return html`<span class="tag tag-d-${state}"><span class="tag-what">${what}</span> ${DIAGNOSIS_STATUS_WORDS[state] ?? state}</span>`;
}

export function proofLink(order: OrderDetail): SafeHtml {
  if (!['repaired', 'verified', 'closed'].includes(order.status)) return html``;
  return html`<a class="button" data-proof href="/api/repair-orders/${order.id}/proof.pdf" target="_blank" rel="noopener">Open the proof (PDF)</a>`;
}
