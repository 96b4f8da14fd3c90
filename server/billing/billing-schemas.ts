import { z } from 'zod';
import {
  CURRENCIES,
  INVOICE_STATUSES,
  MANUAL_PAYMENT_METHODS,
  MAX_AMOUNT_MINOR,
  MAX_QUANTITY,
  MAX_TAX_RATE_BP,
  PAYMENT_NOTE_MAX,
} from '../../src/contracts/billing';

const isoDate = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a date like 2026-12-31.')
  .refine(
    (s) => !Number.isNaN(Date.parse(`${s}T00:00:00Z`)) && new Date(`${s}T00:00:00Z`).toISOString().startsWith(s),
    'Not a real calendar date.',
  );

/** An amount in minor units: a whole, positive number of cents, at most 1,000,000.00. */
export const AmountMinor = z
  .number({ message: 'Enter the amount in minor units (cents), e.g. 4500 for 45.00.' })
  .int('Use whole minor units (cents): 4500 means 45.00; fractions of a cent are not allowed.')
  .positive('The amount must be more than zero.')
  .max(MAX_AMOUNT_MINOR, `The amount must be at most ${MAX_AMOUNT_MINOR / 100} (${MAX_AMOUNT_MINOR} minor units).`);

/** A tax rate in basis points (2000 = 20 %), or null for none. */
export const TaxRateBp = z
  .number()
  .int('Give the tax rate in whole basis points (2000 = 20 %).')
  .min(0, 'The tax rate cannot be negative.')
  .max(MAX_TAX_RATE_BP, 'The tax rate must be at most 100 % (10000 basis points).')
  .nullable();

const text = (max: number, what: string) =>
  z.string().trim().min(1, `${what} is required.`).max(max, `${what}: at most ${max} characters.`);

export const PriceBody = z.strictObject({
  item: text(80, 'Item'),
  description: z.string().trim().max(300, 'Description: at most 300 characters.').default(''),
  amountMinor: AmountMinor,
  taxRateBp: TaxRateBp.default(null),
});
export const PricePatchBody = PriceBody.partial();

export const PriceQuery = z.object({ archived: z.enum(['true', 'false']).optional() });

export const SettingsBody = z.strictObject({ currency: z.enum(CURRENCIES, { message: `Choose one of ${CURRENCIES.join(', ')}.` }) });

export const LineBody = z.strictObject({
  priceId: z.number().int().positive().nullable().default(null),
  description: text(120, 'Description'),
  quantity: z
    .number()
    .int('Quantity must be a whole number.')
    .min(1, 'Quantity must be at least 1.')
    .max(MAX_QUANTITY, `Quantity must be at most ${MAX_QUANTITY}.`),
  unitAmountMinor: AmountMinor,
  taxRateBp: TaxRateBp.default(null),
});

export { IdempotencyKey } from '../http/idempotency-key';

export const InvoiceBody = z.strictObject({
  athleteId: z.number().int().positive(),
  assessmentId: z.number().int().positive().nullable().default(null),
  dueDate: isoDate,
  note: z.string().trim().max(500, 'Note: at most 500 characters.').nullable().default(null),
  lines: z.array(LineBody).min(1, 'Add at least one line.').max(50, 'At most 50 lines.'),
});

export const InvoiceQueryParams = z.object({
  status: z.enum(INVOICE_STATUSES as [string, ...string[]]).optional(),
  athleteId: z.coerce.number().int().positive().optional(),
  from: isoDate.optional(),
  to: isoDate.optional(),
});

const note = z.string('Write the note as text.').trim().max(PAYMENT_NOTE_MAX, `Note: at most ${PAYMENT_NOTE_MAX} characters.`);

/** Body of POST /api/invoices/:id/payments: a bank transfer or cash the clinic received. */
export const ManualPaymentBody = z.strictObject({
  method: z.enum(MANUAL_PAYMENT_METHODS, { message: 'Choose bank transfer or cash.' }),
  paidOn: isoDate,
  note: note.default(''),
});

/** Body of POST /api/invoices/:id/refund: optional, a note for a recorded refund. */
export const RefundBody = z.strictObject({ note: note.optional() }).default({});
