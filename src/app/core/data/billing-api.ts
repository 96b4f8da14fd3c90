import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type {
  BillingSettings,
  CheckoutStart,
  InvoiceDetail,
  InvoiceList,
  InvoiceQuery,
  InvoiceWrite,
  ManualPaymentWrite,
  Price,
  PriceWrite,
  RefundWrite,
} from '../../../contracts/billing';
import { skipErrorSnackbar } from '../http-context';

/**
 * HTTP for billing: the owner's price list and invoices, the athlete's own invoices and card
 * payment. Loads report failures through the page's error state; forms show 422s inline.
 */
@Injectable({ providedIn: 'root' })
export class BillingApi {
  private readonly http = inject(HttpClient);

  settings(): Observable<BillingSettings> {
    return this.http.get<BillingSettings>('/api/billing/settings', { context: skipErrorSnackbar() });
  }

  /** Changes the clinic's currency; 409 `currency_in_use` once invoices exist (shown by the caller). */
  putSettings(body: BillingSettings): Observable<BillingSettings> {
    return this.http.put<BillingSettings>('/api/billing/settings', body, { context: skipErrorSnackbar(409, 422) });
  }

  prices(): Observable<Price[]> {
    return this.http.get<{ prices: Price[] }>('/api/prices', { context: skipErrorSnackbar() }).pipe(map((r) => r.prices));
  }

  /** A new price; `key` (see RetryKeys) makes a resend after a lost answer find the price already made. */
  createPrice(body: PriceWrite, key?: string): Observable<Price> {
    return this.http.post<Price>('/api/prices', body, { context: skipErrorSnackbar(422), headers: keyHeader(key) });
  }

  updatePrice(id: number, body: Partial<PriceWrite>): Observable<Price> {
    return this.http.patch<Price>(`/api/prices/${id}`, body, { context: skipErrorSnackbar(422) });
  }

  /** Takes the price off the list (invoices that used it keep their lines). */
  archivePrice(id: number): Observable<void> {
    return this.http.delete<void>(`/api/prices/${id}`);
  }

  /** The owner's clinic invoices, or the athlete's own issued ones, with totals. */
  invoices(query: InvoiceQuery = {}): Observable<InvoiceList> {
    let params = new HttpParams();
    for (const [k, v] of Object.entries(query)) if (v !== undefined && v !== null && v !== '') params = params.set(k, String(v));
    return this.http.get<InvoiceList>('/api/invoices', { params, context: skipErrorSnackbar() });
  }

  invoice(id: number): Observable<InvoiceDetail> {
    return this.http.get<InvoiceDetail>(`/api/invoices/${id}`, { context: skipErrorSnackbar() });
  }

  /** A new draft; `key` (one per form) makes a resend after a lost answer find the draft already made. */
  createInvoice(body: InvoiceWrite, key?: string): Observable<InvoiceDetail> {
    return this.http.post<InvoiceDetail>('/api/invoices', body, { context: skipErrorSnackbar(422), headers: keyHeader(key) });
  }

  /** Replaces a draft (409 once it was issued or cancelled; 422 shown inline by the form). */
  updateInvoice(id: number, body: InvoiceWrite): Observable<InvoiceDetail> {
    return this.http.put<InvoiceDetail>(`/api/invoices/${id}`, body, { context: skipErrorSnackbar(422, 409) });
  }

  /** Deletes a draft; anything else is refused (409, shown by the error snackbar). */
  deleteInvoice(id: number): Observable<void> {
    return this.http.delete<void>(`/api/invoices/${id}`);
  }

  /**
   * `issue`, `cancel` or `refund` (a refund may carry a note); conflicts (409) come back with the server's reason.
   * `key` (one per act on the page) makes a resend after a lost answer find the act done instead of a 409.
   */
  act(id: number, action: 'issue' | 'cancel' | 'refund', body: RefundWrite = {}, key?: string): Observable<InvoiceDetail> {
    return this.http.post<InvoiceDetail>(`/api/invoices/${id}/${action}`, body, { headers: keyHeader(key) });
  }

  /**
   * Records a bank transfer or cash payment (422 shown inline by the dialog; 409 by the snackbar); `key`
   * (one per dialog) makes a resend after a lost answer find the payment recorded, never a second one.
   */
  recordPayment(id: number, body: ManualPaymentWrite, key?: string): Observable<InvoiceDetail> {
    return this.http.post<InvoiceDetail>(`/api/invoices/${id}/payments`, body, { context: skipErrorSnackbar(422), headers: keyHeader(key) });
  }

  /** Opens a payment page for the athlete's own issued invoice. */
  checkout(id: number): Observable<CheckoutStart> {
    return this.http.post<CheckoutStart>(`/api/invoices/${id}/checkout`, {});
  }

  /** Same-origin URL of the receipt PDF (the session cookie authorises it). */
  receiptUrl(id: number): string {
    return `/api/invoices/${id}/receipt`;
  }
}

/** The `Idempotency-Key` header, when there is a key. */
function keyHeader(key: string | undefined): Record<string, string> {
  return key ? { 'Idempotency-Key': key } : {};
}
