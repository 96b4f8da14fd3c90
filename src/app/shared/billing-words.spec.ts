import {
  STATUS_WORDS,
  amountDueText,
  amountText,
  dayText,
  lineDetail,
  money,
  paidText,
  parseAmount,
  parseTaxPercent,
  taxText,
} from './billing-words';

describe('billing words', () => {
  it('parses amounts to minor units: 45 → 4500, 45.5 → 4550, 1,250.00 → 125000', () => {
    expect(parseAmount('45')).toBe(4500);
    expect(parseAmount('45.5')).toBe(4550);
    expect(parseAmount(' 1,250.00 ')).toBe(125000);
    expect(parseAmount('0.05')).toBe(5);
  });

  it('reads a decimal comma as the decimal mark, never as a thousands separator: 12,50 → 1250, 1.250,00 → 125000', () => {
    expect(parseAmount('12,50')).toBe(1250);
    expect(parseAmount('12,5')).toBe(1250);
    expect(parseAmount('0,05')).toBe(5);
    expect(parseAmount('1.250,00')).toBe(125000);
    expect(parseAmount('1,250')).toBe(125000);
    expect(parseAmount('1,250,000.50')).toBe(125000050);
    expect(parseAmount('12,505')).toBe(1250500);
    expect(parseAmount('1,2,3')).toBeNull();
    expect(parseAmount('12,50.00')).toBeNull();
    expect(parseAmount('1.250')).toBeNull();
  });

  it('refuses fractions of a cent, signs and words', () => {
    expect(parseAmount('45.005')).toBeNull();
    expect(parseAmount('-5')).toBeNull();
    expect(parseAmount('ten')).toBeNull();
    expect(parseAmount('')).toBeNull();
  });

  it('parses tax percentages to basis points: 20 → 2000, 7.5 → 750, empty → no tax, 120 → invalid', () => {
    expect(parseTaxPercent('20')).toBe(2000);
    expect(parseTaxPercent('7.5')).toBe(750);
    expect(parseTaxPercent('7,5')).toBe(750);
    expect(parseTaxPercent('7,25')).toBe(725);
    expect(parseTaxPercent('7,255')).toBeUndefined();
    expect(parseTaxPercent('')).toBeNull();
    expect(parseTaxPercent('120')).toBeUndefined();
    expect(parseTaxPercent('abc')).toBeUndefined();
  });

  it('prints money, amounts and rates: 16200 EUR → 162.00 EUR; 750 bp → 7.5 %', () => {
    expect(money(16200, 'EUR')).toBe('162.00 EUR');
    expect(amountText(125000)).toBe('1250.00');
    expect(taxText(750)).toBe('7.5 %');
    expect(taxText(null)).toBe('-');
  });

  it('sums up a line: "2 × 65.00 EUR · 20 % tax", "1 × 12.34 EUR · no tax"', () => {
    expect(lineDetail({ quantity: 2, unitAmountMinor: 6500, taxRateBp: 2000 }, 'EUR')).toBe('2 × 65.00 EUR · 20 % tax');
    expect(lineDetail({ quantity: 1, unitAmountMinor: 1234, taxRateBp: null }, 'EUR')).toBe('1 × 12.34 EUR · no tax');
  });

  it('writes dates day first: 2026-12-08 → 8 Dec 2026', () => {
    expect(dayText('2026-12-08')).toBe('8 Dec 2026');
    expect(dayText('2027-01-31')).toBe('31 Jan 2027');
  });

  it('says what is due from the issued invoices only', () => {
    const inv = (status: 'issued' | 'paid' | 'cancelled' | 'refunded', totalMinor: number, dueDate: string) => ({
      status,
      totalMinor,
      currency: 'EUR',
      dueDate,
    });
    expect(amountDueText([])).toBe('Nothing to pay');
    expect(
      amountDueText([inv('paid', 14400, '2026-10-20'), inv('cancelled', 500, '2026-01-01'), inv('refunded', 7800, '2026-12-01')]),
    ).toBe('Nothing to pay');
    expect(amountDueText([inv('paid', 14400, '2026-10-20'), inv('issued', 7800, '2026-12-08')])).toBe(
      '1 invoice to pay · 78.00 EUR due 8 Dec 2026',
    );
    expect(amountDueText([inv('issued', 7800, '2026-12-22'), inv('issued', 14400, '2026-12-08')])).toBe(
      '2 invoices to pay · 222.00 EUR, the next due 8 Dec 2026',
    );
  });

  it('says how and when an invoice was paid', () => {
    expect(paidText({ paymentMethod: 'bank_transfer', paidOn: '2026-12-03', paidAt: '2026-12-04T09:00:00Z' })).toBe(
      'Paid by bank transfer on 3 Dec 2026.',
    );
    expect(paidText({ paymentMethod: 'cash', paidOn: '2026-12-03', paidAt: null })).toBe('Paid in cash on 3 Dec 2026.');
    expect(paidText({ paymentMethod: 'card', paidOn: null, paidAt: '2026-10-08T18:12:00Z' })).toBe('Paid by card on 8 Oct 2026.');
    expect(paidText({ paymentMethod: null, paidOn: null, paidAt: null })).toBe('');
    expect(STATUS_WORDS.issued.label).toBe('Issued');
    expect(Object.values(STATUS_WORDS).map((w) => w.label)).toEqual(['Draft', 'Issued', 'Paid', 'Cancelled', 'Refunded']);
  });
});
