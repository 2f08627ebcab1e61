/** The technician's start: their repair orders, the rest of the shop's open ones, and opening a new one. */
import type { Actor } from '../identity/actor';
import type { OrderSummary } from './bay.service';
import { html, type SafeHtml } from './html';
import { page } from './layout.view';
import { statusTag, vehicleLine } from './parts.view';
import { ago } from './words';

function orderCard(o: OrderSummary): SafeHtml {
  return html`<li><a class="order-card" href="/bay/orders/${o.id}">
    <span class="order-card-top"><span class="ro-number">${o.number}</span> ${statusTag(o.status)}</span>
    <span class="order-card-vehicle">${vehicleLine(o.vehicle)}</span>
    <span class="order-card-complaint">${o.complaint}</span>
    <span class="order-card-meta">${o.codes.join(' ')}${o.codes.length ? ' · ' : ''}${o.technician?.name ?? 'not assigned'} · changed ${ago(o.updatedAt)}</span>
  </a></li>`;
}

export function bayHomePage(actor: Actor, data: { mine: OrderSummary[]; others: OrderSummary[] }): SafeHtml {
  return page(
    { title: 'My repair orders', actor, page: 'bay-home' },
    html`<div class="title-row"><h1>My repair orders</h1><a class="button primary" href="/bay/new">New repair order</a></div>
    ${data.mine.length ? html`<ul class="cards">${data.mine.map(orderCard)}</ul>` : html`<p class="empty">Nothing assigned to you right now.</p>`}
    <details class="panel" ${data.mine.length === 0 ? 'open' : ''}>
      <summary><h2>Other open repair orders in the shop (${data.others.length})</h2></summary>
      ${data.others.length ? html`<ul class="cards">${data.others.map(orderCard)}</ul>` : html`<p class="empty">None.</p>`}
    </details>`,
  );
}

export function newOrderPage(actor: Actor): SafeHtml {
  const year = new Date().getFullYear();
  return page(
    { title: 'New repair order', actor, page: 'bay-new', scripts: ['new-order.js'], back: { href: '/bay', label: 'My repair orders' } },
    html`<h1>New repair order</h1>
    <form id="new-order" class="form" novalidate data-technician="${actor.role === 'technician' ? actor.userId : ''}">
      <div class="field">
        <label for="vin">VIN (type it, or scan the label into this field)</label>
        <input id="vin" name="vin" class="vin-input" autocomplete="off" autocapitalize="characters" spellcheck="false" maxlength="40" required aria-describedby="vin-state">
        <p id="vin-state" class="field-state" aria-live="polite">17 characters; the 9th is a check digit.</p>
      </div>
      <label class="check"><input type="checkbox" name="builtOutsideNorthAmerica" id="outside"> Built for a market outside North America (no check digit)</label>
      <label class="check"><input type="checkbox" name="highVoltageSystem" id="high-voltage"> Hybrid or electric: has a high-voltage system (qualified people only)</label>
      <div class="row">
        <div class="field"><label for="year">Model year</label><input id="year" name="year" inputmode="numeric" required min="1981" max="${year + 2}" aria-describedby="year-state"></div>
        <div class="field"><label for="make">Make</label><input id="make" name="make" required maxlength="60"></div>
        <div class="field"><label for="model">Model</label><input id="model" name="model" required maxlength="60"></div>
      </div>
      <p id="year-state" class="field-state when-said" aria-live="polite"></p>
      <div class="row">
        <div class="field"><label for="engine">Engine</label><input id="engine" name="engine" maxlength="80"></div>
        <div class="field"><label for="odometer">Odometer</label><input id="odometer" name="odometer" inputmode="numeric" required></div>
        <fieldset class="field segmented"><legend>Unit</legend>
          <label><input type="radio" name="odometerUnit" value="mi" checked> mi</label>
          <label><input type="radio" name="odometerUnit" value="km"> km</label>
        </fieldset>
      </div>
      <div class="field"><label for="complaint">Complaint, in the customer's words</label><textarea id="complaint" name="complaint" rows="3" required maxlength="4000"></textarea></div>
      <div class="field"><label for="codes">Trouble codes (separate with spaces or commas)</label><input id="codes" name="codes" autocapitalize="characters" autocomplete="off"></div>
      <p class="form-error" role="alert" hidden></p>
      <button class="button primary big" type="submit">Open the repair order</button>
    </form>`,
  );
}
