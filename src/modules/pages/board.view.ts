/** The foreman's board: open repair orders, what needs attention first, and one order's review. */
import type { Actor } from '../identity/actor';
import type { CircuitDiagnosis, OrderDetail, RepairItem, ReviewList } from './bay.service';
import { AGE_CHOICES, type BoardFilter, type BoardItem, type Flag } from './board.service';
import { html, type SafeHtml } from './html';
import { ICON, page } from './layout.view';
import { conclusionCard, diagnosisStatus, orderHeader, pathList, proofLink, rankedCauses, repairsList, reviewsList, statusTag, vehicleLine } from './parts.view';
import { ago, formatEntered, percent } from './words';
import { approvalBanner, closeForm, type Approval } from './approval.view';

const FLAG_ICON: Record<Flag['code'], SafeHtml> = {
  approval: ICON.check,
  stale: ICON.flag,
  close: ICON.check,
  unassigned: ICON.flag,
  contradiction: ICON.cross,
  silent: ICON.clock,
  unsure: ICON.flag,
  between: ICON.flag,
  returned: ICON.pending,
};

function flagList(flags: Flag[]): SafeHtml {
  if (flags.length === 0) return html`<p class="flags none">Nothing needs you now.</p>`;
  return html`<ul class="flags">${flags.map((f) => html`<li class="flag flag-${f.code}">${FLAG_ICON[f.code]}<span>${f.text}</span></li>`)}</ul>`;
}

function card(item: BoardItem): SafeHtml {
  const o = item.order;
  return html`<li class="board-card ${item.flags.length ? 'needs' : ''}" data-order-number="${o.number}">
    <a class="board-link" href="/board/orders/${o.id}">
      <span class="order-card-top"><span class="ro-number">${o.number}</span> ${statusTag(o.status)}
        ${item.review?.decision === 'approved'
          ? item.approvalState === 'stale'
            ? html`<span class="tag tag-stale">${ICON.flag} Approval stale</span>`
            : html`<span class="tag tag-approved">${ICON.check} Approved</span>`
          : ''}</span>
      <span class="order-card-vehicle">${vehicleLine(o.vehicle)}</span>
      ${flagList(item.flags)}
      ${item.circuits.map(
        (c) => html`<span class="board-circuit">${c.label}: ${c.leading ? `${c.leading.label} (${percent(c.leading.probability)})` : 'no diagnosis'} · ${c.counted} test${c.counted === 1 ? '' : 's'}</span>`,
      )}
      <span class="order-card-meta">${o.technician?.name ?? 'not assigned'} · opened ${ago(o.createdAt)} · ${item.lastReadingAt ? `last reading ${ago(item.lastReadingAt)}` : 'no reading yet'}</span>
    </a>
  </li>`;
}

export function boardPage(actor: Actor, items: BoardItem[], technicians: Array<{ id: string; name: string }>, filter: BoardFilter): SafeHtml {
  const attention = items.filter((i) => i.flags.length > 0);
  const rest = items.filter((i) => i.flags.length === 0);
  return page(
    { title: 'Shop board', actor, page: 'board' },
    html`<h1>Shop board</h1>
    <form class="filters" method="get" action="/board" aria-label="Filters">
      <div class="field"><label for="f-tech">Technician</label><select id="f-tech" name="technician">
        <option value="">Everyone</option>
        ${technicians.map((t) => html`<option value="${t.id}" ${t.id === filter.technicianId ? 'selected' : ''}>${t.name}</option>`)}
      </select></div>
      <div class="field"><label for="f-age">Age</label><select id="f-age" name="age">
        ${AGE_CHOICES.map((a) => html`<option value="${a.days}" ${a.days === (filter.minAgeDays ?? 0) ? 'selected' : ''}>${a.label}</option>`)}
      </select></div>
      <button class="button" type="submit">Show</button>
    </form>
    <section aria-labelledby="attention-h"><h2 id="attention-h">Needs attention (${attention.length})</h2>
      ${attention.length ? html`<ul class="cards">${attention.map(card)}</ul>` : html`<p class="empty">Nothing needs attention.</p>`}
    </section>
    <section aria-labelledby="rest-h"><h2 id="rest-h">Going to plan (${rest.length})</h2>
      ${rest.length ? html`<ul class="cards">${rest.map(card)}</ul>` : html`<p class="empty">None.</p>`}
    </section>`,
  );
}

/** Who works on the order: an unassigned one shows on nobody's "My repair orders" until the foreman gives it out. */
function assignForm(order: OrderDetail, technicians: Array<{ id: string; name: string }>): SafeHtml {
  return html`<form id="assign-form" class="filters" data-order="${order.id}" data-version="${order.version}" novalidate>
    <div class="field"><label for="assign-tech">Technician on this order</label><select id="assign-tech" name="technicianId">
      <option value="" ${order.technician ? '' : 'selected'}>Not assigned</option>
      ${technicians.map((t) => html`<option value="${t.id}" ${t.id === order.technician?.id ? 'selected' : ''}>${t.name}</option>`)}
    </select></div>
    <button class="button" type="submit">Assign</button>
    <p class="form-error" role="alert" hidden></p>
  </form>`;
}

function verificationTable(c: CircuitDiagnosis): SafeHtml {
  if (c.verification.length === 0) return html``;
  const show = (r: { overload: boolean; valueEntered: number | null; unitEntered: string } | null) => (r ? formatEntered(r.valueEntered, r.unitEntered, r.overload) : '—');
  return html`<table class="table"><caption>Before and after the repair</caption>
    <thead><tr><th scope="col">Test</th><th scope="col">Before</th><th scope="col">After</th></tr></thead>
    <tbody>${c.verification.map((v) => html`<tr><th scope="row">${v.label}</th><td>${show(v.before)}</td><td>${show(v.after)}</td></tr>`)}</tbody></table>`;
}

export function reviewPage(
  actor: Actor,
  data: { order: OrderDetail; circuits: CircuitDiagnosis[]; repairs: RepairItem[]; reviews: ReviewList; approval?: Approval },
  flags: Flag[],
  technicians: Array<{ id: string; name: string }> = [],
): SafeHtml {
  const { order, circuits, repairs, reviews } = data;
  const reviewable = order.status === 'repaired' || order.status === 'verified';
  // A stale approval is no approval: the foreman approves again (or returns) on the evidence as it is now.
  const approved = reviews.latest?.decision === 'approved' && data.approval?.state !== 'stale';
  return page(
    { title: `Review ${order.number}`, actor, page: 'board-order', scripts: ['board.js'], back: { href: '/board', label: 'Shop board' } },
    html`${orderHeader(order)}
    ${approvalBanner(data.approval, order.status)}
    ${closeForm(order, data.approval)}
    ${flagList(flags)}
    ${order.status === 'closed' ? '' : assignForm(order, technicians)}
    ${circuits.map(
      (c) => html`<section class="panel" aria-labelledby="c-${c.circuit.id}">
        <h2 id="c-${c.circuit.id}">${c.circuit.label} ${diagnosisStatus(c.atRepair ?? c.diagnosis)}</h2>
        ${conclusionCard(c.atRepair ?? c.diagnosis)}
        <div class="two-col"><div><h3>${c.atRepair ? 'Causes as diagnosed before the repair' : 'Likely causes'}</h3>${rankedCauses(c.atRepair ?? c.diagnosis)}</div>
        <div><h3>Readings in the order taken</h3>${pathList(c)}</div></div>
        ${verificationTable(c)}
      </section>`,
    )}
    <section class="panel" aria-labelledby="repairs-h"><h2 id="repairs-h">Repairs</h2>${repairsList(repairs)}</section>
    <section class="panel" aria-labelledby="reviews-h"><h2 id="reviews-h">Decisions</h2>${reviewsList(reviews)}
      ${
        reviewable
          ? html`<form id="review-form" class="form" data-order="${order.id}" novalidate>
            <div class="field"><label for="review-comment">Comment ${approved ? '(needed to withdraw)' : '(needed to return)'}</label>
              <textarea id="review-comment" name="comment" rows="3" maxlength="2000"></textarea></div>
            <p class="form-error" role="alert" hidden></p>
            <div class="button-row">
              ${approved
                ? html`<button class="button big" type="submit" value="withdrawn">Withdraw the approval</button>`
                : html`<button class="button primary big" type="submit" value="approved">${ICON.check} Approve</button>
                   <button class="button big" type="submit" value="returned">${ICON.flag} Return to the technician</button>`}
            </div>
          </form>`
          : html`<p class="muted">A decision can be made once the repair is recorded.</p>`
      }
    </section>
    <p>${proofLink(order)}</p>`,
  );
}
