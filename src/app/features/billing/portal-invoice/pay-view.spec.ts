import { payView, returnedWith } from './pay-view';

describe('payView', () => {
  const open = { status: 'issued' as const, checkoutState: 'pending' as const };

  it('never says paid from the redirect alone: success + issued = waiting, then unconfirmed after the polls', () => {
    expect(payView(open, 'success', false)).toBe('waiting');
    expect(payView(open, 'success', true)).toBe('unconfirmed');
  });

  it('follows the server: paid, refunded and cancelled win over the redirect', () => {
    expect(payView({ status: 'paid', checkoutState: 'none' }, 'cancel', false)).toBe('paid');
    expect(payView({ status: 'refunded', checkoutState: 'none' }, null, false)).toBe('refunded');
    expect(payView({ status: 'cancelled', checkoutState: 'none' }, 'success', false)).toBe('cancelled');
  });

  it('shows a declined payment and a payment page left without paying; the amount due otherwise', () => {
    expect(payView({ status: 'issued', checkoutState: 'failed' }, 'success', false)).toBe('failed');
    expect(payView(open, 'cancel', false)).toBe('left_payment_page');
    expect(payView(open, null, false)).toBe('due');
  });

  it('reads ?checkout= safely', () => {
    expect(returnedWith('success')).toBe('success');
    expect(returnedWith('cancel')).toBe('cancel');
    expect(returnedWith('paid')).toBeNull();
    expect(returnedWith(null)).toBeNull();
  });
});
