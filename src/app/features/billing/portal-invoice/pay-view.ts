import type { CheckoutState, InvoiceStatus } from '../../../../contracts/billing';

/** What the athlete's invoice page says, from the SERVER's status and how the browser came back. */
export type PayView = 'due' | 'waiting' | 'unconfirmed' | 'paid' | 'failed' | 'left_payment_page' | 'cancelled' | 'refunded';

/** How the payment page sent the browser back (`?checkout=`), or null. */
export type ReturnedWith = 'success' | 'cancel' | null;

/**
 * The page state. The browser's return alone never says "paid": after `success` the page waits
 * (polling) until the server, told by the payment service's signed webhook, says so.
 */
export function payView(inv: { status: InvoiceStatus; checkoutState: CheckoutState }, returned: ReturnedWith, timedOut: boolean): PayView {
  if (inv.status === 'paid') return 'paid';
  if (inv.status === 'refunded') return 'refunded';
  if (inv.status === 'cancelled') return 'cancelled';
  if (inv.checkoutState === 'failed') return 'failed';
  if (returned === 'success') return timedOut ? 'unconfirmed' : 'waiting';
  if (returned === 'cancel') return 'left_payment_page';
  return 'due';
}

/** `?checkout=` read safely. */
export function returnedWith(value: string | null): ReturnedWith {
  return value === 'success' || value === 'cancel' ? value : null;
}

/** Polls at most this many times (every {@link POLL_MS}) before saying "not confirmed yet". */
export const POLL_TRIES = 40;
export const POLL_MS = 1500;
