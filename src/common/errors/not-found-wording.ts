/**
 * A technician sees only the repair orders they opened or are assigned to. "No repair order with id … in this
 * shop" would be untrue to them when the order is another technician's, so they are told what the 404 means; no
 * data about the order is given either way.
 */
import type { DomainException } from './domain.exception';

export function messageFor(error: DomainException, reader?: { role?: string } | null): string {
  if (error.code !== 'repair_order.not_found' || reader?.role !== 'technician') return error.message;
  const id = /with id (\S+)/.exec(error.message)?.[1];
  return (
    `${id ? `Repair order ${id}` : 'This repair order'} is not among yours: a technician sees the orders they opened or are ` +
    'assigned to. If it is another technician’s, a foreman can assign it to you.'
  );
}
