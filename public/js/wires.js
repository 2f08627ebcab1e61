// Wire identification: readings per cavity in, proposed roles with their reasons out.
import { api, busy, showError } from './api.js';
import { typedDecimal } from './numbers.js';

const form = document.getElementById('wires-form');
const rows = document.getElementById('wire-rows');
const result = document.getElementById('wires-result');
const ROLE = {
  reference: ['5 V reference', 'reference'],
  signal_pull_up: ['Signal (biased up)', 'signal'],
  signal_pull_down: ['Signal (pulled down or not biased)', 'signal'],
  ground: ['Sensor ground', 'ground'],
  not_identified: ['Not identified', 'unknown'],
};

/** Ω per unit of the ohms field's unit choice. */
const OHMS_PER = { 'Ω': 1, 'kΩ': 1e3, 'MΩ': 1e6 };

function renumber() {
  rows.querySelectorAll('[data-row]').forEach((row, i) =>
    row.querySelectorAll('input, select').forEach((input) => {
      if (!input.id) return;
      const base = input.id.replace(/-\d+$/, '');
      row.querySelector(`label[for="${input.id}"]`)?.setAttribute('for', `${base}-${i}`);
      input.id = `${base}-${i}`;
    }),
  );
}

document.getElementById('add-row').addEventListener('click', () => {
  const copy = rows.querySelector('[data-row]').cloneNode(true);
  copy.querySelectorAll('input').forEach((input) => (input.type === 'checkbox' ? (input.checked = false) : (input.value = '')));
  rows.append(copy);
  renumber();
  copy.querySelector('input').focus();
});

form.addEventListener('change', (event) => {
  if (event.target.name !== 'circuitKind') return;
  const want = event.target.value === 'two_wire_thermistor' ? 2 : 3;
  const list = [...rows.querySelectorAll('[data-row]')];
  if (list.length > want) list.slice(want).forEach((r) => r.remove());
  if (want === 2) list.slice(0, 2).forEach((r, i) => (r.querySelector('[name=cavity]').value = String(i + 1)));
});

function number(text) {
  const t = String(text).trim();
  return t === '' ? undefined : (typedDecimal(t) ?? t);
}

function show(answer) {
  result.replaceChildren();
  const h = document.createElement('h2');
  h.textContent = 'Proposed roles';
  const list = document.createElement('div');
  list.className = 'wire-result';
  const pairs = [];
  for (const c of answer.cavities) {
    const [words, role] = ROLE[c.role] || [c.role, 'unknown'];
    pairs.push(`${c.cavity}:${role}`);
    const box = document.createElement('div');
    box.className = 'wire-role';
    const title = document.createElement('p');
    const strong = document.createElement('strong');
    strong.textContent = `Cavity ${c.cavity}: ${words}`;
    title.append(strong, ` (${Math.round((c.probabilities[c.role] || 0) * 100)} %)`);
    const why = document.createElement('p');
    why.textContent = c.reason;
    box.append(title, why);
    list.append(box);
  }
  result.append(h, list);
  if (answer.next) {
    const next = document.createElement('p');
    next.className = 'notice';
    next.textContent = `To be surer: ${answer.next.instruction}`;
    result.append(next);
  }
  const use = document.createElement('a');
  use.className = 'button primary big';
  use.href = `/bay/orders/${form.dataset.order}?kind=${encodeURIComponent(answer.circuitKind)}&cavities=${encodeURIComponent(pairs.join(','))}#add-circuit`;
  use.textContent = 'Use these roles for a new circuit';
  result.append(use);
  result.hidden = false;
}

form.addEventListener('submit', async (event) => {
  event.preventDefault();
  const kind = form.querySelector('input[name=circuitKind]:checked').value;
  const cavities = [...rows.querySelectorAll('[data-row]')]
    .map((row) => {
      const open = row.querySelector('[name=open]').checked;
      const volts = number(row.querySelector('[name=volts]').value);
      const typed = number(row.querySelector('[name=ohms]').value);
      const per = OHMS_PER[row.querySelector('[name=ohmsUnit]').value] ?? 1;
      // Scaled once, rounded to the digits typed: 2.53 kΩ is 2530 Ω, not 2529.9999999999995.
      const ohms = open ? 'open' : typeof typed === 'number' ? Number((typed * per).toPrecision(12)) : typed;
      return {
        cavity: row.querySelector('[name=cavity]').value.trim(),
        ...(volts === undefined ? {} : { volts }),
        ...(ohms === undefined ? {} : { ohms }),
      };
    })
    .filter((c) => c.cavity);
  await busy(form, async () => {
    try {
      showError(form, null);
      const { body } = await api('POST', '/api/wires/identify', { circuitKind: kind, cavities });
      show(body);
      result.scrollIntoView({ block: 'start' });
    } catch (error) {
      showError(form, error);
    }
  });
});
