// Same-origin calls to the Tracebay API. The session travels in its HttpOnly cookie; every change also sends
// the session's CSRF token (from the tracebay_csrf cookie) in the X-CSRF-Token header.

/** The session's CSRF token, or '' before sign-in. */
export function csrfToken() {
  const found = document.cookie.split(';').map((c) => c.trim()).find((c) => c.startsWith('tracebay_csrf='));
  return found ? decodeURIComponent(found.slice('tracebay_csrf='.length)) : '';
}

export class ApiError extends Error {
  constructor(status, body) {
    const error = body && body.error;
    super((error && error.message) || `The service answered ${status}.`);
    this.status = status;
    this.findings = (error && error.findings) || [];
  }
}

export async function api(method, path, body) {
  const response = await fetch(path, {
    method,
    credentials: 'same-origin',
    headers: {
      accept: 'application/json',
      ...(body === undefined ? {} : { 'content-type': 'application/json' }),
      ...(method === 'GET' ? {} : { 'x-csrf-token': csrfToken() }),
    },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  const text = await response.text();
  let parsed = null;
  try {
    parsed = text ? JSON.parse(text) : null;
  } catch {
    parsed = null;
  }
  if (!response.ok) throw new ApiError(response.status, parsed);
  return { status: response.status, body: parsed };
}

/** A key made once per reading: sent again after a lost answer, the service stores it only once. */
export function newKey() {
  const bytes = new Uint8Array(18);
  crypto.getRandomValues(bytes);
  return 'r' + Array.from(bytes, (b) => b.toString(16).padStart(2, '0')).join('');
}

export function describeError(error) {
  if (error instanceof ApiError) {
    const details = error.findings.slice(0, 4).map((f) => `${String(f.path || '').replace(/^body\./, '')}: ${f.message}`);
    return details.length > 1 || (details.length === 1 && !error.message.includes(error.findings[0].message))
      ? `${error.message} ${details.join('; ')}`
      : error.message;
  }
  if (error instanceof TypeError) return 'No connection to the service. Try again when the tablet is back online.';
  return String((error && error.message) || error);
}

/** Shows an error under a form (or clears it with null) and marks the fields the service named. */
export function showError(form, error) {
  const box = form.querySelector('.form-error');
  form.querySelectorAll('[aria-invalid]').forEach((el) => el.removeAttribute('aria-invalid'));
  if (!box) return;
  if (!error) {
    box.hidden = true;
    box.textContent = '';
    return;
  }
  box.textContent = describeError(error);
  box.hidden = false;
  for (const f of (error instanceof ApiError && error.findings) || []) {
    const name = String(f.path || '').split('.').pop();
    const field = name && form.querySelector(`[name="${CSS.escape(name)}"]`);
    if (field) field.setAttribute('aria-invalid', 'true');
  }
}

/** Disables a form's buttons while a call is in flight. */
export async function busy(form, work) {
  const buttons = [...form.querySelectorAll('button')];
  buttons.forEach((b) => (b.disabled = true));
  try {
    return await work();
  } finally {
    buttons.forEach((b) => (b.disabled = false));
  }
}
