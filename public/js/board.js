// The foreman's decision on one repair order: approve, return with a comment, or withdraw an approval.
import { api, busy, showError } from './api.js';

const form = document.getElementById('review-form');
if (form) {
  form.addEventListener('submit', async (event) => {
    event.preventDefault();
    const decision = event.submitter?.value || 'approved';
    const comment = form.querySelector('#review-comment').value.trim();
    if (decision !== 'approved' && !comment) {
      showError(form, new Error('Say why in the comment: the technician reads it.'));
      form.querySelector('#review-comment').focus();
      return;
    }
    await busy(form, async () => {
      try {
        showError(form, null);
        await api('POST', `/api/repair-orders/${form.dataset.order}/reviews`, { decision, comment });
        location.reload();
      } catch (error) {
        showError(form, error);
      }
    });
  });
}

// Closing, once verified and approved on the evidence as it is now (the service refuses it otherwise).
const close = document.getElementById('close-form');
if (close) {
  close.addEventListener('submit', async (event) => {
    event.preventDefault();
    await busy(close, async () => {
      try {
        showError(close, null);
        await api('POST', `/api/repair-orders/${close.dataset.order}/status`, { to: 'closed', version: Number(close.dataset.version) });
        location.reload();
      } catch (error) {
        showError(close, error);
      }
    });
  });
}

// Giving the order to a technician (or taking it back): the change names the version read, so two foremen never
// overwrite each other unseen.
const assign = document.getElementById('assign-form');
if (assign) {
  assign.addEventListener('submit', async (event) => {
    event.preventDefault();
    const technicianId = assign.querySelector('#assign-tech').value || null;
    await busy(assign, async () => {
      try {
        showError(assign, null);
        await api('PATCH', `/api/repair-orders/${assign.dataset.order}`, { version: Number(assign.dataset.version), technicianId });
        location.reload();
      } catch (error) {
        showError(assign, error);
      }
    });
  });
}
