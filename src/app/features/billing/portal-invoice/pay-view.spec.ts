import { payView, returnedWith } from './pay-view';

describe('payView', () => {
  const open = { status: 'open' as const, checkoutState: 'pending' as const };

  it('never says paid from the redirect alone: success + open = waiting, then unconfirmed after the polls', () => {
    expect(payView(open, 'success', false)).toBe('waiting');
    expect(payView(open, 'success', true)).toBe('unconfirmed');
  });

  it('follows the server: paid, refunded and void win over the redirect', () => {
    expect(payView({ status: 'paid', checkoutState: 'none' }, 'cancel', false)).toBe('paid');
    expect(payView({ status: 'refunded', checkoutState: 'none' }, null, false)).toBe('refunded');
    expect(payView({ status: 'void', checkoutState: 'none' }, 'success', false)).toBe('void');
  });

  it('shows a declined payment and a cancelled one; plain open otherwise', () => {
    expect(payView({ status: 'open', checkoutState: 'failed' }, 'success', false)).toBe('failed');
    expect(payView(open, 'cancel', false)).toBe('cancelled');
    expect(payView(open, null, false)).toBe('open');
  });

  it('reads ?checkout= safely', () => {
    expect(returnedWith('success')).toBe('success');
    expect(returnedWith('cancel')).toBe('cancel');
    expect(returnedWith('paid')).toBeNull();
    expect(returnedWith(null)).toBeNull();
  });
});
