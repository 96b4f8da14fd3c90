import { z } from 'zod';
import { LEGAL_LIMITS as L } from '../../src/contracts/billing';

/** Trims each line of a multi-line address and drops empty ones. */
const addressLines = (s: string) =>
  s
    .split(/\r?\n/)
    .map((l) => l.trim())
    .filter(Boolean)
    .join('\n');

/** Body of PUT /api/clinic/legal-details: every field given; legal name and address required. */
export const LegalDetailsBody = z.strictObject({
  legalName: z
    .string('Give the legal name.')
    .trim()
    .min(1, 'The legal name is required: invoices must name the seller.')
    .max(L.legalName, `Legal name: at most ${L.legalName} characters.`),
  address: z
    .string('Give the address.')
    .transform(addressLines)
    .pipe(
      z
        .string()
        .min(1, 'The address is required: invoices must carry the seller’s address.')
        .max(L.address, `Address: at most ${L.address} characters.`)
        .refine((s) => s.split('\n').length <= L.addressLines, `Address: at most ${L.addressLines} lines.`),
    ),
  taxNumber: z
    .string('Give the tax number, or leave it empty.')
    .trim()
    .max(L.taxNumber, `Tax number: at most ${L.taxNumber} characters.`)
    .regex(/^[A-Za-z0-9 .\-/]*$/, 'Tax number: letters, digits, spaces, dots, dashes and slashes only.'),
  contactLine: z
    .string('Give a contact line, or leave it empty.')
    .trim()
    .max(L.contactLine, `Contact line: at most ${L.contactLine} characters.`)
    .refine((s) => !/[\r\n]/.test(s), 'Contact line: one line only.'),
});
