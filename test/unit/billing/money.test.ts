/**
 * The billing money arithmetic: integer minor units, tax in basis points rounded half-up per line,
 * sums per invoice, amounts as people type and read them, and when a provider's refund gives back
 * the whole invoice. Every expected figure is worked by hand in the test ([calc]); the property
 * checks compare with half-up rounding done independently in BigInt.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { MAX_AMOUNT_MINOR, MAX_QUANTITY, MAX_TAX_RATE_BP, formatMinor, invoiceTotals, lineAmounts } from '../../../src/contracts/billing';
import { amountText, money, parseAmount, parseTaxPercent } from '../../../src/app/shared/billing-words';
import { previewTotals, toLineWrite, type LineDraft } from '../../../src/app/features/billing/invoice-form/invoice-lines';
import { refundsWholeInvoice } from '../../../server/billing/payment-webhook';
import type { RefundConfirmed } from '../../../server/billing/payments';

/** n / d rounded half-up for n ≥ 0, d > 0, in BigInt: floor((2n + d) / 2d). */
const halfUp = (n: bigint, d: bigint) => (2n * n + d) / (2n * d);

describe('money arithmetic [calc]', () => {
  it('3 × 45.00 at 20 % tax = 135.00 + 27.00 = 162.00', () => {
    expect(lineAmounts({ quantity: 3, unitAmountMinor: 4500, taxRateBp: 2000 })).toEqual({
      netMinor: 13500,
      taxMinor: 2700,
      totalMinor: 16200,
    });
  });

  it('half-up per line: 0.25 at 10 % = 0.025 → 0.03; 0.24 at 10 % = 0.024 → 0.02; 1.05 at 7.5 % = 0.07875 → 0.08', () => {
    expect(lineAmounts({ quantity: 1, unitAmountMinor: 25, taxRateBp: 1000 }).taxMinor).toBe(3);
    expect(lineAmounts({ quantity: 1, unitAmountMinor: 24, taxRateBp: 1000 }).taxMinor).toBe(2);
    expect(lineAmounts({ quantity: 1, unitAmountMinor: 105, taxRateBp: 750 }).taxMinor).toBe(8);
  });

  it('exactly half a cent goes up, just under half goes down: 0.15 at 10 % = 0.015 → 0.02; 0.01 at 49.99 % = 0.004999 → 0.00', () => {
    expect(lineAmounts({ quantity: 1, unitAmountMinor: 15, taxRateBp: 1000 })).toEqual({ netMinor: 15, taxMinor: 2, totalMinor: 17 });
    expect(lineAmounts({ quantity: 1, unitAmountMinor: 1, taxRateBp: 4999 })).toEqual({ netMinor: 1, taxMinor: 0, totalMinor: 1 });
    expect(lineAmounts({ quantity: 1, unitAmountMinor: 1, taxRateBp: 5000 })).toEqual({ netMinor: 1, taxMinor: 1, totalMinor: 2 });
  });

  it('rounds per line, not per invoice: two lines of 0.05 at 10 % → tax 0.01 + 0.01 = 0.02 (per invoice it would be 0.01)', () => {
    expect(
      invoiceTotals([
        { quantity: 1, unitAmountMinor: 5, taxRateBp: 1000 },
        { quantity: 1, unitAmountMinor: 5, taxRateBp: 1000 },
      ]),
    ).toEqual({ subtotalMinor: 10, taxMinor: 2, totalMinor: 12 });
  });

  it('no tax rate = no tax; an empty invoice is zero', () => {
    expect(lineAmounts({ quantity: 2, unitAmountMinor: 999, taxRateBp: null })).toEqual({ netMinor: 1998, taxMinor: 0, totalMinor: 1998 });
    expect(invoiceTotals([])).toEqual({ subtotalMinor: 0, taxMinor: 0, totalMinor: 0 });
  });

  it('a mixed invoice: 2 × 120.00 at 20 % + 1 × 12.34 untaxed + 3 × 0.99 at 7 % = 254.97 + 48.21 tax = 303.18', () => {
    // 24000 → tax 4800; 1234 → 0; 297 × 0.07 = 20.79 → 21. Subtotal 25531, tax 4821, total 30352.
    expect(
      invoiceTotals([
        { quantity: 2, unitAmountMinor: 12000, taxRateBp: 2000 },
        { quantity: 1, unitAmountMinor: 1234, taxRateBp: null },
        { quantity: 3, unitAmountMinor: 99, taxRateBp: 700 },
      ]),
    ).toEqual({ subtotalMinor: 25531, taxMinor: 4821, totalMinor: 30352 });
  });

  it('the largest line allowed stays exact: 1,000,000.00 × 1000 at 100 % = 100,000,000,000 + the same in tax', () => {
    expect(MAX_AMOUNT_MINOR).toBe(100_000_000);
    expect(lineAmounts({ quantity: MAX_QUANTITY, unitAmountMinor: MAX_AMOUNT_MINOR, taxRateBp: MAX_TAX_RATE_BP })).toEqual({
      netMinor: 100_000_000_000,
      taxMinor: 100_000_000_000,
      totalMinor: 200_000_000_000,
    });
  });

  it('property: tax is net × rate rounded half-up (BigInt), total = net + tax, and the invoice sums its lines', () => {
    const line = fc.record({
      quantity: fc.integer({ min: 1, max: MAX_QUANTITY }),
      unitAmountMinor: fc.integer({ min: 1, max: MAX_AMOUNT_MINOR }),
      taxRateBp: fc.option(fc.integer({ min: 0, max: MAX_TAX_RATE_BP }), { nil: null }),
    });
    fc.assert(
      fc.property(fc.array(line, { maxLength: 6 }), (lines) => {
        let sub = 0n;
        let tax = 0n;
        for (const l of lines) {
          const net = BigInt(l.quantity) * BigInt(l.unitAmountMinor);
          const t = halfUp(net * BigInt(l.taxRateBp ?? 0), 10_000n);
          expect(lineAmounts(l)).toEqual({ netMinor: Number(net), taxMinor: Number(t), totalMinor: Number(net + t) });
          sub += net;
          tax += t;
        }
        expect(invoiceTotals(lines)).toEqual({ subtotalMinor: Number(sub), taxMinor: Number(tax), totalMinor: Number(sub + tax) });
      }),
    );
  });
});

describe('amounts as people read and type them', () => {
  it('prints minor units with two decimals and thousands separators', () => {
    expect(formatMinor(0)).toBe('0.00');
    expect(formatMinor(5)).toBe('0.05');
    expect(formatMinor(99)).toBe('0.99');
    expect(formatMinor(100)).toBe('1.00');
    expect(formatMinor(99_999)).toBe('999.99');
    expect(formatMinor(100_000)).toBe('1,000.00');
    expect(formatMinor(123_456_789)).toBe('1,234,567.89');
    expect(formatMinor(-12_345)).toBe('-123.45');
    expect(formatMinor(-5)).toBe('-0.05');
    expect(money(16_200, 'EUR')).toBe('162.00 EUR');
    expect(amountText(125_000)).toBe('1250.00');
    expect(amountText(5)).toBe('0.05');
  });

  it('reads typed amounts to minor units, and refuses what is not one', () => {
    expect(parseAmount('1,250.5')).toBe(125_050);
    expect(parseAmount(' 45 ')).toBe(4500);
    expect(parseAmount('045')).toBe(4500);
    expect(parseAmount('0.5')).toBe(50);
    expect(parseAmount('999999999.99')).toBe(99_999_999_999);
    for (const bad of ['1234567890', '45.', '.5', '4 5', '45,00.1x', '1e3', '45.123']) expect(parseAmount(bad)).toBeNull();
  });

  it('property: what formatMinor prints, parseAmount reads back', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 99_999_999_999 }), (m) => {
        expect(parseAmount(formatMinor(m))).toBe(m);
      }),
    );
  });

  it('reads tax percentages to basis points, at most 100 %', () => {
    expect(parseTaxPercent('0')).toBe(0);
    expect(parseTaxPercent('7.25')).toBe(725);
    expect(parseTaxPercent('7.5')).toBe(750);
    expect(parseTaxPercent(' 20 ')).toBe(2000);
    expect(parseTaxPercent('100')).toBe(10_000);
    expect(parseTaxPercent('   ')).toBeNull();
    for (const bad of ['100.01', '1000', '20.', '-5', '7.125', '20 %']) expect(parseTaxPercent(bad)).toBeUndefined();
  });
});

describe('invoice form lines', () => {
  const draft = (over: Partial<LineDraft>): LineDraft => ({
    priceId: null,
    description: ' Taping ',
    quantity: 2,
    amount: '12.50',
    tax: '10',
    ...over,
  });

  it('writes a readable line with trimmed words, minor units and basis points', () => {
    expect(toLineWrite(draft({}))).toEqual({ priceId: null, description: 'Taping', quantity: 2, unitAmountMinor: 1250, taxRateBp: 1000 });
    expect(toLineWrite(draft({ tax: '' }))?.taxRateBp).toBeNull();
  });

  it('no line while the amount, the rate or the quantity cannot be read', () => {
    for (const bad of [{ amount: 'x' }, { tax: '120' }, { quantity: null }, { quantity: 0 }, { quantity: -1 }, { quantity: 1.5 }]) {
      expect(toLineWrite(draft(bad))).toBeNull();
    }
  });

  it('previews 2 × 12.50 at 10 % = 25.00 + 2.50 and a second line 1 × 0.05 at 10 % = 0.05 + 0.01', () => {
    expect(previewTotals([draft({}), draft({ quantity: 1, amount: '0.05' })])).toEqual({
      subtotalMinor: 2505,
      taxMinor: 251,
      totalMinor: 2756,
    });
    expect(previewTotals([draft({}), draft({ amount: '' })])).toBeNull();
    expect(previewTotals([])).toEqual({ subtotalMinor: 0, taxMinor: 0, totalMinor: 0 });
  });
});

describe('refunds the provider confirms', () => {
  const invoice = { total_minor: 16_200, currency: 'EUR' };
  const refund = (over: Partial<RefundConfirmed> = {}): RefundConfirmed => ({
    type: 'refund-confirmed',
    paymentId: 'pi_1',
    refundedMinor: 16_200,
    currency: 'EUR',
    done: true,
    refundId: null,
    ...over,
  });

  it('gives back the whole invoice only when done, for the whole total, in its currency', () => {
    expect(refundsWholeInvoice(refund(), invoice)).toBe(true);
    expect(refundsWholeInvoice(refund({ done: false }), invoice)).toBe(false);
    expect(refundsWholeInvoice(refund({ refundedMinor: 16_199 }), invoice)).toBe(false);
    expect(refundsWholeInvoice(refund({ refundedMinor: 16_201 }), invoice)).toBe(false);
    expect(refundsWholeInvoice(refund({ currency: 'GBP' }), invoice)).toBe(false);
    expect(refundsWholeInvoice(refund({ currency: null }), invoice)).toBe(false);
  });
});
