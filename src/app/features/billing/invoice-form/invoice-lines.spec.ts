import type { Price } from '../../../../contracts/billing';
import { lineFromPrice, previewTotals, priceForAssessment, toLineWrite } from './invoice-lines';

const retest: Price = { id: 2, item: 'Re-test', description: '', amountMinor: 6500, currency: 'EUR', taxRateBp: 2000, archived: false };
const gait: Price = { id: 1, item: 'Gait assessment', description: '', amountMinor: 12000, currency: 'EUR', taxRateBp: 2000, archived: false };

describe('invoice lines', () => {
  it('fills a line from a price: Re-test 65.00 at 20 %', () => {
    expect(lineFromPrice(retest)).toEqual({ priceId: 2, description: 'Re-test', quantity: 1, amount: '65.00', tax: '20' });
  });

  it('previews 3 × 45.00 at 20 % = 162.00 plus 12.34 untaxed = 174.34', () => {
    const totals = previewTotals([
      { priceId: null, description: 'Session', quantity: 3, amount: '45.00', tax: '20' },
      { priceId: null, description: 'Tape', quantity: 1, amount: '12.34', tax: '' },
    ]);
    expect(totals).toEqual({ subtotalMinor: 14734, taxMinor: 2700, totalMinor: 17434 });
  });

  it('gives no preview while a line is unreadable', () => {
    expect(toLineWrite({ priceId: null, description: 'x', quantity: 1, amount: '1.005', tax: '' })).toBeNull();
    expect(previewTotals([{ priceId: null, description: 'x', quantity: 0, amount: '10', tax: '' }])).toBeNull();
  });

  it('suggests the price for an assessment kind', () => {
    expect(priceForAssessment('retest', [gait, retest])?.id).toBe(2);
    expect(priceForAssessment('baseline', [retest, gait])?.id).toBe(1);
    expect(priceForAssessment('retest', [gait])).toBeNull();
  });
});
