import type { Price } from '../../../contracts/billing';

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
