import type { Knex } from 'knex';
import type { ClinicLegalDetails } from '../../src/contracts/billing';

/** The legal-details columns of a `clinics` row. */
interface LegalRow {
  legal_name: string | null;
  legal_address: string | null;
  tax_number: string | null;
  contact_line: string | null;
}

/** Knex access to the clinic's own settings (legal details). */
export const clinicRepository = {
  async legalDetails(db: Knex, clinicId: number): Promise<ClinicLegalDetails> {
    const r = await db('clinics')
      .where({ id: clinicId })
      .first<LegalRow | undefined>('legal_name', 'legal_address', 'tax_number', 'contact_line');
    return {
      legalName: r?.legal_name ?? '',
      address: r?.legal_address ?? '',
      taxNumber: r?.tax_number ?? '',
      contactLine: r?.contact_line ?? '',
    };
  },
  async putLegalDetails(db: Knex, clinicId: number, d: ClinicLegalDetails): Promise<void> {
    const empty = (s: string) => (s === '' ? null : s);
    await db('clinics')
      .where({ id: clinicId })
      .update({
        legal_name: empty(d.legalName),
        legal_address: empty(d.address),
        tax_number: empty(d.taxNumber),
        contact_line: empty(d.contactLine),
      });
  },
};
