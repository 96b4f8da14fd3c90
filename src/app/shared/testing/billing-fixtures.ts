import type { InvoiceDetail, InvoiceLine, Price } from '../../../contracts/billing';

/** The clinic's gait assessment price for client specs: 120.00 EUR at 20 % tax (id 1). */
export const GAIT_PRICE: Price = {
  id: 1,
  item: 'Gait assessment',
  description: '',
  amountMinor: 12000,
  currency: 'EUR',
  taxRateBp: 2000,
  archived: false,
};

/** The re-test price for client specs: 65.00 EUR at 20 % tax (id 2). */
export const RETEST_PRICE: Price = { ...GAIT_PRICE, id: 2, item: 'Re-test', amountMinor: 6500 };

/** A draft of Ada Kestrel's Re-test, 65.00 + 20 % = 78.00 EUR (no lines listed). */
export const DRAFT_INVOICE: InvoiceDetail = {
  id: 999,
  number: null,
  status: 'draft',
  athleteId: 4,
  athleteName: 'Ada Kestrel',
  currency: 'EUR',
  totalMinor: 7800,
  subtotalMinor: 6500,
  taxMinor: 1300,
  dueDate: '2026-12-31',
  issuedAt: null,
  paidAt: null,
  createdAt: '2026-12-01T09:00:00Z',
  assessmentId: null,
  assessment: null,
  note: null,
  clinicName: 'Larchwood Running Clinic',
  cancelledAt: null,
  refundedAt: null,
  checkoutState: 'none',
  paymentMethod: null,
  paidOn: null,
  paymentNote: null,
  refundNote: null,
  clinicLegal: { legalName: '', address: '', taxNumber: '', contactLine: '' },
  clinicLogoUrl: null,
  lines: [],
};

/** A Re-test line (price 2): `quantity` × 65.00 EUR at 20 % tax, the figures written out per unit. */
export function retestLine(id: number, quantity = 1): InvoiceLine {
  return {
    id,
    priceId: 2,
    description: 'Re-test',
    quantity,
    unitAmountMinor: 6500,
    taxRateBp: 2000,
    netMinor: 6500 * quantity,
    taxMinor: 1300 * quantity,
    totalMinor: 7800 * quantity,
  };
}
