// Forms shared by the order page and the test screen: record a repair, mark the repair verified.
import { api, busy, showError } from './api.js';
import { typedInteger } from './numbers.js';

export function bindRepairForm(root, done) {
  const form = root.querySelector('#repair-form');
  if (!form) return;
  const rows = form.querySelector('#parts-rows');
  form.querySelector('#add-part')?.addEventListener('click', () => {
    const first = rows.querySelector('.part-row');
    const copy = first.cloneNode(true);
    const n = rows.querySelectorAll('.part-row').length;
    copy.querySelectorAll('input').forEach((input) => {
      const base = input.id.replace(/-\d+$/, '');
      copy.querySelector(`label[for="${input.id}"]`)?.setAttribute('for', `${base}-${n}`);
      input.id = `${base}-${n}`;
      input.value = input.name === 'partQty' ? '1' : '';
    });
    rows.append(copy);
    copy.querySelector('input')?.focus();
  });
  form.addEventListener('submit', async (event) => {
    event.preventDefault();
    const data = new FormData(form);
    const parts = [...rows.querySelectorAll('.part-row')]
      .map((row) => ({
        name: row.querySelector('[name=partName]').value.trim(),
        number: row.querySelector('[name=partNumber]').value.trim(),
        quantity: (() => {
          const typed = row.querySelector('[name=partQty]').value.trim() || '1';
          return typedInteger(typed) ?? typed;
        })(),
      }))
      .filter((p) => p.name)
      .map((p) => (p.number ? p : { name: p.name, quantity: p.quantity }));
    const body = {
      circuitId: form.dataset.circuit || undefined,
      part: data.get('part'),
      action: String(data.get('action') || '').trim(),
      location: String(data.get('location') || '').trim(),
      parts,
      note: String(data.get('note') || '').trim(),
    };
    await busy(form, async () => {
      try {
        showError(form, null);
        await api('POST', `/api/repair-orders/${form.dataset.order}/repairs`, body);
        done();
      } catch (error) {
        showError(form, error);
      }
    });
  });
}

export function bindVerifiedForm(root, done) {
  const form = root.querySelector('#verified-form');
  if (!form) return;
  form.addEventListener('submit', async (event) => {
    event.preventDefault();
    await busy(form, async () => {
      try {
        showError(form, null);
        await api('POST', `/api/repair-orders/${form.dataset.order}/status`, { to: 'verified' });
        done();
      } catch (error) {
        showError(form, error);
      }
    });
  });
}
