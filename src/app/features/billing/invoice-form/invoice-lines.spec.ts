import {
  formFromInvoice,
  lineFromInvoiceLine,
  lineFromPrice,
  presetFromQuery,
  previewTotals,
  priceForAssessment,
  toLineWrite,
} from './invoice-lines';
import { DRAFT_INVOICE, GAIT_PRICE, RETEST_PRICE, retestLine } from '../../../shared/testing/billing-fixtures';

describe('invoice lines', () => {
  it('fills a line from a price: Re-test 65.00 at 20 %', () => {
    expect(lineFromPrice(RETEST_PRICE)).toEqual({ priceId: 2, description: 'Re-test', quantity: 1, amount: '65.00', tax: '20' });
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
    expect(priceForAssessment('retest', [GAIT_PRICE, RETEST_PRICE])?.id).toBe(2);
    expect(priceForAssessment('baseline', [RETEST_PRICE, GAIT_PRICE])?.id).toBe(1);
    expect(priceForAssessment('retest', [GAIT_PRICE])).toBeNull();
  });

  it('turns saved lines back into what was typed: 1,250.00 at 7.5 %, 45.00 without tax', () => {
    expect(lineFromInvoiceLine({ priceId: null, description: 'Block', quantity: 2, unitAmountMinor: 125000, taxRateBp: 750 })).toEqual({
      priceId: null,
      description: 'Block',
      quantity: 2,
      amount: '1250.00',
      tax: '7.5',
    });
    expect(lineFromInvoiceLine({ priceId: 2, description: 'Re-test', quantity: 1, unitAmountMinor: 4500, taxRateBp: null })).toEqual({
      priceId: 2,
      description: 'Re-test',
      quantity: 1,
      amount: '45.00',
      tax: '',
    });
  });

  it('a saved draft fills the form and previews the same total the server stored (2 × 65.00 at 20 % = 156.00)', () => {
    const f = formFromInvoice({
      ...DRAFT_INVOICE,
      id: 9,
      totalMinor: 15600,
      createdAt: '',
      assessmentId: 11,
      assessment: { id: 11, kind: 'retest', date: '2026-11-24' },
      clinicName: '',
      subtotalMinor: 13000,
      taxMinor: 2600,
      lines: [retestLine(1, 2)],
    });
    expect(f).toMatchObject({ athleteId: 4, assessmentId: 11, dueDate: '2026-12-31', note: '' });
    expect(previewTotals(f.lines)).toEqual({ subtotalMinor: 13000, taxMinor: 2600, totalMinor: 15600 });
  });

  it('reads ?athlete= and ?assessment= as positive ids; an assessment needs its athlete', () => {
    expect(presetFromQuery('4', '11')).toEqual({ athleteId: 4, assessmentId: 11 });
    expect(presetFromQuery('4', null)).toEqual({ athleteId: 4, assessmentId: null });
    expect(presetFromQuery(null, '11')).toEqual({ athleteId: null, assessmentId: null });
    expect(presetFromQuery('0', 'x')).toEqual({ athleteId: null, assessmentId: null });
    expect(presetFromQuery('4', '-2')).toEqual({ athleteId: 4, assessmentId: null });
    expect(presetFromQuery('4.5', '1e3')).toEqual({ athleteId: null, assessmentId: null });
  });
});
