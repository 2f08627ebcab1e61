// The repair-order page: add a circuit (then go test it), mark the repair verified.
import { api, busy, showError } from './api.js';
import { bindVerifiedForm } from './forms.js';

const form = document.getElementById('circuit-form');
if (form) {
  form.addEventListener('submit', async (event) => {
    event.preventDefault();
    const data = new FormData(form);
    const cavities = {};
    const names = data.getAll('cavity');
    const roles = data.getAll('role');
    names.forEach((name, i) => {
      const n = String(name).trim();
      if (n) cavities[n] = roles[i];
    });
    const body = {
      kind: data.get('kind'),
      sensor: String(data.get('sensor') || '').trim(),
      label: String(data.get('label') || '').trim(),
      cavities,
    };
    await busy(form, async () => {
      try {
        showError(form, null);
        const { body: circuit } = await api('POST', `/api/repair-orders/${form.dataset.order}/circuits`, body);
        location.assign(`/bay/orders/${form.dataset.order}/circuits/${circuit.id}`);
      } catch (error) {
        showError(form, error);
      }
    });
  });
}

bindVerifiedForm(document, () => location.reload());
