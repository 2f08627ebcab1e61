/** Where the foreman's approval stands, shown at the top of an order (bay and board) and as the board's flags. */
import type { EvidenceService } from '../proofs/evidence.service';
import { html, type SafeHtml } from './html';

export type Approval = Awaited<ReturnType<EvidenceService['approval']>>;

/** The line at the top of an order: approved (of the evidence now), stale, or nothing yet. */
export function approvalBanner(approval: Approval | undefined, status: string): SafeHtml {
  if (!approval) return html``;
  const who = approval.decision ? `${approval.decision.by.name}` : '';
  if (approval.state === 'approved') {
    return html`<p class="notice approved" role="status"><strong>Approved by ${who}</strong> on the evidence as it is now${
      status === 'closed' ? '; the order is closed.' : status === 'verified' ? ': the foreman can close the order.' : '; the repair is still to be verified.'
    }</p>`;
  }
  if (approval.state === 'stale') {
    return html`<p class="notice returned" role="status"><strong>Approval stale:</strong> ${who} approved, then readings, a repair or the status changed. It needs approving again before the order can close.</p>`;
  }
  if (status === 'verified') return html`<p class="notice" role="status"><strong>Not yet approved:</strong> verified, waiting for the foreman's decision.</p>`;
  return html``;
}

/** The foreman's close button, once the order is verified and approved on the evidence as it is now. */
export function closeForm(order: { id: string; version: number; status: string }, approval: Approval | undefined): SafeHtml {
  if (order.status !== 'verified' || approval?.state !== 'approved') return html``;
  return html`<form id="close-form" class="form" data-order="${order.id}" data-version="${order.version}">
    <p class="form-error" role="alert" hidden></p>
    <button class="button primary big" type="submit">Close the repair order</button>
  </form>`;
}
