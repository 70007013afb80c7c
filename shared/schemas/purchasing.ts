import { z } from 'zod';
import { oneLine } from './text';
import { email } from './common';

/** Where a purchase request stands. A request part-received stays 'ordered' until all has come in. */
export const PURCHASE_STATES = ['requested', 'approved', 'ordered', 'received', 'cancelled'] as const;
export type PurchaseState = (typeof PURCHASE_STATES)[number];
export const PURCHASE_STATE_LABELS: Record<PurchaseState, string> = {
  requested: 'Waiting for approval',
  approved: 'Approved, not yet ordered',
  ordered: 'On order',
  received: 'Received',
  cancelled: 'Called off',
};

const note = z
  .string()
  .trim()
  .max(300, 'At most 300 characters')
  .nullish()
  .transform((v) => v || null);

export const supplierInputSchema = z.object({
  name: oneLine(z.string({ message: 'Enter a name' }).trim().min(2, 'Enter a name').max(120, 'At most 120 characters')),
  email: z
    .union([z.literal(''), email])
    .nullish()
    .transform((v) => v || null),
  phone: oneLine(z.string().trim().max(40, 'At most 40 characters'))
    .nullish()
    .transform((v) => v || null),
  note,
});
export type SupplierInput = z.output<typeof supplierInputSchema>;
export type SupplierRow = { id: string; name: string; email: string | null; phone: string | null; note: string | null; parts: number };

const quantity = z.number({ message: 'Enter a quantity' }).positive('The quantity must be above zero').max(1_000_000, 'That quantity is implausibly high');

export const purchaseRequestInputSchema = z.object({
  partTypeId: z.uuid({ message: 'Choose a part' }),
  quantity,
  note,
});
export type PurchaseRequestInput = z.output<typeof purchaseRequestInputSchema>;

export const purchaseReceiptInputSchema = z.object({ quantity, note });
export type PurchaseReceiptInput = z.output<typeof purchaseReceiptInputSchema>;

export const purchaseListQuery = z.object({
  status: z.enum([...PURCHASE_STATES, 'open'], { message: 'Not a state' }).default('open'),
});

export type PurchaseRequestRow = {
  id: string;
  number: number;
  status: PurchaseState;
  part: { id: string; partNumber: string; name: string; stockUnit: string; packSize: number };
  supplier: string | null;
  quantity: number;
  received: number;
  note: string | null;
  requestedAt: string;
  requestedBy: string | null;
  approvedBy: string | null;
  orderedAt: string | null;
  orderedBy: string | null;
  receipts: { at: string; quantity: number; by: string | null }[];
};

export const suggestionQuery = z.object({
  weeks: z.coerce.number({ message: 'Enter a number of weeks' }).int('Whole weeks').min(1, 'At least 1 week').max(26, 'At most 26 weeks').default(4),
});

export type SuggestedOrderRow = {
  partTypeId: string;
  partNumber: string;
  name: string;
  supplier: string | null;
  stockUnit: string;
  /** Parts expected to be used over the horizon, and how that was worked out. */
  expectedUse: number;
  basis: 'arc-starts' | 'arc-hours' | 'daily-use';
  onHand: number;
  onOrder: number;
  /** Requested or approved but not yet ordered. */
  pending: number;
  reorderPoint: number;
  packSize: number;
  minOrderQty: number;
  quantity: number;
  unitCost: number;
};
