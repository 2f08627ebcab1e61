// The guided test screen: number pad, saving a reading through the unsent queue, and showing the new state.
import { newKey } from './api.js';
import { typedDecimal } from './numbers.js';
import { bindRepairForm, bindVerifiedForm } from './forms.js';
import { discard, enqueue, flush, unsent } from './reading-queue.js';

const main = document.getElementById('main');
let orderId = null;

function parseValue(text) {
  if (/^ol$/i.test(text.trim())) return 'OL';
  return typedDecimal(text);
}

function bindPad(form) {
  const input = form.querySelector('#reading-value');
  const help = form.querySelector('#reading-help');
  form.querySelectorAll('.key').forEach((key) =>
    key.addEventListener('click', () => {
      const k = key.dataset.key;
      let v = input.value === 'OL' ? '' : input.value;
      if (k === 'back') v = v.slice(0, -1);
      else if (k === 'clear') v = '';
      else if (k === 'OL') v = 'OL';
      else if (k === '-') v = v.startsWith('-') ? v.slice(1) : `-${v}`;
      else if (k === '.') v = v.includes('.') ? v : `${v || '0'}.`;
      else v = v === '0' ? k : v + k;
      input.value = v;
      input.removeAttribute('aria-invalid');
    }),
  );
  form.addEventListener('submit', (event) => {
    event.preventDefault();
    const entry = JSON.parse(form.dataset.entry);
    const value = parseValue(input.value);
    const error = form.querySelector('.form-error');
    if (value === null) {
      error.textContent = input.value.trim() ? `“${input.value}” is not a number. Use digits and one decimal point, or OL.` : 'Enter the reading first.';
      error.hidden = false;
      input.setAttribute('aria-invalid', 'true');
      return;
    }
    error.hidden = true;
    const unit = form.querySelector('input[name=unit]:checked').value;
    const note = form.querySelector('#reading-note').value.trim();
    const body = {
      ...entry.request,
      circuitId: form.dataset.circuit,
      value,
      unit,
      phase: entry.phase,
      note,
      clientKey: newKey(),
      takenAt: new Date().toISOString(),
      ...(entry.supersedes ? { supersedes: entry.supersedes } : {}),
    };
    const shown = `${value === 'OL' ? 'OL' : input.value.trim()} ${unit}`;
    enqueue(form.dataset.order, body, `${shown} — ${entry.title}`, { value: shown, test: entry.title });
    input.value = '';
    form.querySelector('#reading-note').value = '';
    help.textContent = 'Kept on this tablet: not yet saved until the list above clears.';
    flush();
  });
}

function renderUnsent() {
  const box = document.getElementById('unsent');
  if (!box) return;
  const list = unsent(orderId);
  box.hidden = list.length === 0;
  box.replaceChildren();
  if (list.length === 0) return;
  const h = document.createElement('h2');
  h.textContent = `Not yet saved (${list.length})`;
  const p = document.createElement('p');
  p.textContent = navigator.onLine
    ? 'These readings are on this tablet only. They are being sent; the next test appears once the service has them.'
    : 'No connection. These readings are kept on this tablet only and are sent when the connection returns.';
  const ul = document.createElement('ul');
  for (const entry of list) {
    const li = document.createElement('li');
    li.dataset.unsent = entry.key;
    const state = entry.state === 'refused' ? `refused: ${entry.error}` : entry.state === 'sending' ? 'sending…' : 'waiting for the connection';
    li.textContent = `${entry.label} — ${state}`;
    if (entry.state === 'refused') {
      li.className = 'refused';
      const b = document.createElement('button');
      b.type = 'button';
      b.className = 'button small';
      b.textContent = 'Discard';
      b.addEventListener('click', () => discard(entry.key));
      li.append(' ', b);
    }
    ul.append(li);
  }
  box.append(h, p, ul);
}

function bind() {
  const form = main.querySelector('#reading-form');
  orderId = form?.dataset.order ?? main.querySelector('[data-order]')?.dataset.order ?? orderId;
  if (form) bindPad(form);
  bindRepairForm(main, () => refresh());
  bindVerifiedForm(main, () => refresh());
  renderUnsent();
}

/**
 * After a save: says what was saved (value and test), marks the test that follows when it is a different one, and
 * brings its title into view, so a reading is never entered against a test that changed unnoticed.
 */
function confirmSaved(saved, previousTitle) {
  const last = saved.filter((s) => s.orderId === orderId && s.test).pop();
  const heading = main.querySelector('#entry-h');
  const now = heading ? heading.textContent.trim() : null;
  const box = document.createElement('div');
  box.id = 'saved';
  box.className = 'saved-note';
  box.setAttribute('role', 'status');
  const p = document.createElement('p');
  const strong = document.createElement('strong');
  strong.textContent = last ? `Saved: ${last.value}` : `Saved ${saved.length} reading${saved.length === 1 ? '' : 's'}`;
  p.append(strong, last ? ` for “${last.test}”.` : '.');
  box.append(p);
  const changed = heading && previousTitle !== null && now !== previousTitle;
  if (heading) {
    const next = document.createElement('p');
    next.textContent = changed ? `The test has changed. Next: ${now}` : `Same test again: ${now}`;
    next.className = changed ? 'test-changed' : '';
    box.append(next);
    heading.closest('.entry')?.classList.add(changed ? 'entry-changed' : 'entry-same');
  }
  const anchor = main.querySelector('.test-head');
  anchor ? anchor.after(box) : main.prepend(box);
  // The confirmation sits just above the test's panel: with it at the top, the new title is in view below it.
  box.scrollIntoView({ block: 'start' });
  if (heading) heading.focus({ preventScroll: true });
}

/** Re-renders the screen from the server: the same page, without a correction or verification choice in the URL. */
async function refresh(saved = []) {
  const url = location.pathname;
  const previous = main.querySelector('#entry-h');
  const previousTitle = previous ? previous.textContent.trim() : null;
  try {
    const response = await fetch(url, { credentials: 'same-origin', headers: { accept: 'text/html' } });
    if (!response.ok) return;
    const doc = new DOMParser().parseFromString(await response.text(), 'text/html');
    const fresh = doc.getElementById('main');
    if (!fresh) return;
    history.replaceState(null, '', url);
    main.replaceChildren(...fresh.childNodes);
    document.title = doc.title;
    bind();
    if (saved.length) confirmSaved(saved, previousTitle);
  } catch {
    /* offline: the queue keeps the readings, and the screen says so */
  }
}

window.addEventListener('tracebay:queue', (event) => {
  renderUnsent();
  if (event.detail && event.detail.sent > 0) refresh(event.detail.saved || []);
});
window.addEventListener('online', renderUnsent);
window.addEventListener('offline', renderUnsent);
bind();
