// Readings not yet on the server, kept in this browser's storage until the service confirms them. Each carries
// the clientKey made when it was entered, so a reading sent twice (the answer was lost) is stored once.

import { csrfToken } from './api.js';

const STORE = 'tracebay.unsent.v1';
const RETRY_MS = 4000;
let flushing = null;

function load() {
  try {
    const list = JSON.parse(localStorage.getItem(STORE) || '[]');
    return Array.isArray(list) ? list : [];
  } catch {
    return [];
  }
}

function save(list) {
  localStorage.setItem(STORE, JSON.stringify(list));
}

function announce(detail) {
  window.dispatchEvent(new CustomEvent('tracebay:queue', { detail }));
}

export function unsent(orderId) {
  return load().filter((e) => !orderId || e.orderId === orderId);
}

/** Keeps the reading before anything is sent: a dropped connection cannot lose it. */
export function enqueue(orderId, body, label, shown = {}) {
  const list = load();
  if (!list.some((e) => e.key === body.clientKey)) {
    list.push({ key: body.clientKey, orderId, body, label, value: shown.value ?? null, test: shown.test ?? null, queuedAt: new Date().toISOString(), state: 'waiting', error: null });
    save(list);
  }
  announce({ sent: 0 });
}

/** Only for readings the service refused: they were never stored, so nothing on record is lost. */
export function discard(key) {
  save(load().filter((e) => e.key !== key || e.state !== 'refused'));
  announce({ sent: 0 });
}

function update(key, change) {
  save(load().map((e) => (e.key === key ? { ...e, ...change } : e)));
}

async function sendAll() {
  let sent = 0;
  const saved = [];
  for (const entry of load()) {
    if (entry.state === 'refused') continue;
    update(entry.key, { state: 'sending' });
    let response;
    try {
      response = await fetch(`/api/repair-orders/${encodeURIComponent(entry.orderId)}/measurements`, {
        method: 'POST',
        credentials: 'same-origin',
        headers: { 'content-type': 'application/json', accept: 'application/json', 'x-csrf-token': csrfToken() },
        body: JSON.stringify(entry.body),
      });
    } catch {
      update(entry.key, { state: 'waiting' });
      break; // offline: keep this and everything after it, in order
    }
    if (response.ok) {
      save(load().filter((e) => e.key !== entry.key));
      sent++;
      saved.push({ key: entry.key, orderId: entry.orderId, label: entry.label, value: entry.value, test: entry.test });
    } else if (response.status >= 500 || response.status === 429) {
      update(entry.key, { state: 'waiting' });
      break;
    } else {
      let message = `The service refused it (${response.status}).`;
      try {
        const body = await response.json();
        if (body && body.error && body.error.message) message = body.error.message;
      } catch {
        /* keep the plain message */
      }
      update(entry.key, { state: 'refused', error: message });
    }
  }
  announce({ sent, saved });
  return sent;
}

/** Sends what is waiting, one at a time and in order; concurrent calls share one run. */
export function flush() {
  if (!flushing) flushing = sendAll().finally(() => (flushing = null));
  return flushing;
}

let started = false;
export function startAutoFlush() {
  if (started) return;
  started = true;
  window.addEventListener('online', () => flush());
  setInterval(() => {
    if (navigator.onLine && load().some((e) => e.state !== 'refused')) flush();
  }, RETRY_MS);
  // Another tab of the same shop saved or sent something.
  window.addEventListener('storage', (event) => event.key === STORE && announce({ sent: 0 }));
  flush();
}
