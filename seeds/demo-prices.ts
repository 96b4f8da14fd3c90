import type { Knex } from 'knex';

/** The invented demo clinic's price list (minor units of EUR; 20 % tax, an invented rate). */
export const DEMO_PRICES = [
  {
    item: 'Gait assessment',
    description: 'First visit: history, filmed treadmill run, frame-by-frame review, written findings.',
    amount_minor: 12000,
    tax_rate_bp: 2000,
  },
  { item: 'Re-test', description: 'Filmed follow-up run compared with the baseline visit.', amount_minor: 6500, tax_rate_bp: 2000 },
  {
    item: '8-week plan package',
    description: 'Staged loading plan with weekly check-ins for eight weeks.',
    amount_minor: 24000,
    tax_rate_bp: 2000,
  },
] as const;

/** Inserts the demo price list for the clinic (inside the seed's transaction). */
export async function seedDemoPrices(trx: Knex, clinicId: number, at: string): Promise<void> {
  await trx('prices').insert(DEMO_PRICES.map((p) => ({ clinic_id: clinicId, currency: 'EUR', created_at: at, updated_at: at, ...p })));
}
