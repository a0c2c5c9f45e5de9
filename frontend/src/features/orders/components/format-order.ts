/** Quantity with its unit, as the supplier delivers it. */
export function formatOrderQuantity(quantity: number | null | undefined, unit: string): string {
  if (quantity === null || quantity === undefined) return '–';
  return unit === 'kg' ? `${quantity.toLocaleString('en-GB')} kg` : `${quantity} cylinder${quantity === 1 ? '' : 's'}`;
}

export const ACTION_TEXT: Record<string, string> = {
  raised: 'Raised',
  submitted: 'Submitted for approval',
  held: 'Held as a draft',
  quantity_changed: 'Quantity changed',
  approved_first: 'First approval (above the approver’s limit)',
  approved: 'Approved',
  po_created: 'Purchase order created',
  ordered: 'Ordered: e-mailed to the supplier',
  emailed: 'E-mailed',
  email_failed: 'E-mail failed',
  rejected: 'Rejected',
  cancelled: 'Cancelled',
  delivered: 'Delivered',
  part_delivered: 'Delivered in part',
};
