// New repair order: the VIN is checked as it is typed (or scanned) by the service's own 49 CFR 565 rule.
import { api, busy, showError } from './api.js';
import { typedInteger } from './numbers.js';

const form = document.getElementById('new-order');
const vin = document.getElementById('vin');
const outside = document.getElementById('outside');
const state = document.getElementById('vin-state');
const yearField = document.getElementById('year');
const yearState = document.getElementById('year-state');
let timer = null;
let asked = 0;
/** What the last good VIN check said: the years its 10th character stands for, and the vehicle on file. */
let known = null;

/** Warns (never blocks) when the model year typed does not fit the VIN, or the VIN is on file with another year. */
function checkYear() {
  if (!yearState) return;
  const year = typedInteger(yearField.value);
  const notes = [];
  if (known && year !== null && known.modelYearCandidates && !known.modelYearCandidates.includes(year)) {
    notes.push(`The VIN's 10th character stands for ${known.modelYearCandidates.join(' or ')}, not ${year}: check the year or the VIN.`);
  }
  if (known && known.onFile && year !== null && known.onFile.year !== year) {
    notes.push(`This VIN is already on file as a ${known.onFile.year} ${known.onFile.make} ${known.onFile.model}; the order will use the vehicle on file.`);
  } else if (known && known.onFile && year === null) {
    notes.push(`This VIN is already on file as a ${known.onFile.year} ${known.onFile.make} ${known.onFile.model}.`);
  }
  yearState.textContent = notes.join(' ');
  yearState.className = `field-state when-said ${notes.length ? 'warn' : ''}`;
}

function say(text, kind) {
  state.textContent = text;
  state.className = `field-state ${kind || ''}`;
}

/** What a scanner or a hurried thumb adds: spaces, dashes, lower case. */
function cleaned(text) {
  return text.replace(/[\s-]/g, '').toUpperCase();
}

async function check() {
  const value = cleaned(vin.value);
  if (value !== vin.value) vin.value = value;
  if (!value) return say('17 characters; the 9th is a check digit.');
  const mine = ++asked;
  try {
    const { body } = await api('GET', `/api/vins/${encodeURIComponent(value)}${outside.checked ? '?outsideNorthAmerica=true' : ''}`);
    if (mine !== asked) return;
    if (body.ok) {
      known = body;
      const years = body.modelYearCandidates ? ` Model year ${body.modelYearCandidates.join(' or ')}.` : '';
      say(`✓ ${body.checkDigit === 'valid' ? 'Check digit correct.' : 'Format correct (no check digit outside North America).'}${years}`, 'ok');
      if (!yearField.value && body.onFile) yearField.value = String(body.onFile.year);
      else if (!yearField.value && body.modelYearCandidates) {
        const now = new Date().getFullYear() + 1;
        yearField.value = String(body.modelYearCandidates.filter((y) => y <= now).pop() ?? '');
      }
      vin.setAttribute('aria-invalid', 'false');
      checkYear();
    } else {
      known = null;
      checkYear();
      say(`${value.length} of 17 characters. ${body.findings[0].message}`, value.length >= 17 ? 'bad' : '');
      vin.setAttribute('aria-invalid', value.length >= 17 ? 'true' : 'false');
    }
  } catch (error) {
    if (mine === asked) say(`${value.length} of 17 characters. The VIN cannot be checked right now (no connection).`);
  }
}

vin.addEventListener('input', () => {
  clearTimeout(timer);
  timer = setTimeout(check, 120);
});
outside.addEventListener('change', check);
yearField.addEventListener('input', checkYear);

form.addEventListener('submit', async (event) => {
  event.preventDefault();
  const data = new FormData(form);
  // A number the page cannot read goes as typed, so the service's answer names the field and what it expects.
  const num = (name) => {
    const typed = String(data.get(name) || '').trim();
    return typed === '' ? undefined : (typedInteger(typed) ?? typed);
  };
  const body = {
    vehicle: {
      vin: cleaned(String(data.get('vin') || '')),
      builtOutsideNorthAmerica: outside.checked,
      highVoltageSystem: data.get('highVoltageSystem') === 'on',
      year: num('year'),
      make: String(data.get('make') || '').trim(),
      model: String(data.get('model') || '').trim(),
      engine: String(data.get('engine') || '').trim(),
      odometer: num('odometer'),
      odometerUnit: data.get('odometerUnit'),
    },
    complaint: String(data.get('complaint') || '').trim(),
    codes: String(data.get('codes') || '').split(/[\s,;]+/).filter(Boolean),
    ...(form.dataset.technician ? { technicianId: form.dataset.technician } : {}),
  };
  await busy(form, async () => {
    try {
      showError(form, null);
      const { body: order } = await api('POST', '/api/repair-orders', body);
      location.assign(`/bay/orders/${order.id}`);
    } catch (error) {
      showError(form, error);
    }
  });
});
