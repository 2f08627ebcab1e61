// On every page: say plainly when the tablet is offline, and keep sending readings that are not yet saved.
import { startAutoFlush, unsent } from './reading-queue.js';

const line = document.getElementById('connection');

function render() {
  if (!line) return;
  const waiting = unsent().filter((e) => e.state !== 'refused').length;
  if (!navigator.onLine) {
    line.textContent = `No connection. ${waiting ? `${waiting} reading${waiting === 1 ? '' : 's'} kept on this tablet, not yet saved; ` : 'Readings you enter are kept on this tablet and '}sent when the connection returns.`;
    line.hidden = false;
  } else if (waiting && document.body.dataset.page !== 'bay-test') {
    line.textContent = `${waiting} reading${waiting === 1 ? '' : 's'} not yet saved: sending…`;
    line.hidden = false;
  } else {
    line.hidden = true;
  }
}

window.addEventListener('online', render);
window.addEventListener('offline', render);
window.addEventListener('tracebay:queue', render);
render();
startAutoFlush();
