// New repair order: the VIN is checked as it is typed (or scanned) by the service's own 49 CFR 565 rule.
import { api, busy, showError } from './api.js';

const form = document.getElementById('new-order');
const vin = document.getElementById('vin');
const outside = document.getElementById('outside');
const state = document.getElementById('vin-state');
let timer = null;
let asked = 0;

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
      const years = body.modelYearCandidates ? ` Model year ${body.modelYearCandidates.join(' or ')}.` : '';
      say(`✓ ${body.checkDigit === 'valid' ? 'Check digit correct.' : 'Format correct (no check digit outside North America).'}${years}`, 'ok');
      const year = document.getElementById('year');
      if (!year.value && body.modelYearCandidates) {
        const now = new Date().getFullYear() + 1;
        year.value = String(body.modelYearCandidates.filter((y) => y <= now).pop() ?? '');
      }
      vin.setAttribute('aria-invalid', 'false');
    } else {
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

form.addEventListener('submit', async (event) => {
  event.preventDefault();
  const data = new FormData(form);
  const num = (name) => (String(data.get(name) || '').trim() === '' ? NaN : Number(data.get(name)));
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
  for (const k of ['year', 'odometer']) if (Number.isNaN(body.vehicle[k])) body.vehicle[k] = null;
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
