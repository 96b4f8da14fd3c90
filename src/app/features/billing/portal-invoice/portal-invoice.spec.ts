import type { HttpTestingController } from '@angular/common/http/testing';
import type { ComponentFixture } from '@angular/core/testing';
import { ActivatedRoute, convertToParamMap } from '@angular/router';
import { BehaviorSubject } from 'rxjs';
import { buttonWithText, flushApiError } from '../../../shared/testing/api-errors';
import type { InvoiceDetail } from '../../../../contracts/billing';
import { POLL_MS } from './pay-view';
import { PortalInvoice } from './portal-invoice';
import { mountPage, wait } from '../../../shared/testing/mount-page';
import { DRAFT_INVOICE, retestLine } from '../../../shared/testing/billing-fixtures';

/** Re-test 65.00 at 20 % = 78.00 EUR, issued, a card payment under way. */
function anInvoice(over: Partial<InvoiceDetail> = {}): InvoiceDetail {
  return {
    ...DRAFT_INVOICE,
    id: 7,
    number: 'TF-2026-0001',
    status: 'issued',
    athleteId: 1,
    issuedAt: '2026-12-01T10:00:00Z',
    checkoutState: 'pending',
    lines: [retestLine(1)],
    ...over,
  };
}

describe('PortalInvoice', () => {
  let fixture: ComponentFixture<PortalInvoice>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  async function open(checkout: string | null) {
    const query = new BehaviorSubject(convertToParamMap(checkout ? { checkout } : {}));
    ({ fixture, element, backend } = mountPage(PortalInvoice, { id: '7' }, [
      { provide: ActivatedRoute, useValue: { queryParamMap: query } },
    ]));
    await wait(10);
  }
  const settle = async () => {
    await wait(20);
    fixture.detectChanges();
    await fixture.whenStable();
    fixture.detectChanges();
  };
  afterEach(() => backend.verify());

  it('after the payment page says success it waits for the server, polling every POLL_MS, until the webhook made it paid', async () => {
    // Fake timers: the test moves the clock itself, so the poll interval is checked to the millisecond.
    vi.useFakeTimers();
    try {
      const advance = async (ms: number) => {
        await vi.advanceTimersByTimeAsync(ms);
        fixture.detectChanges();
      };
      const opened = open('success');
      await vi.advanceTimersByTimeAsync(10);
      await opened;
      backend.expectOne('/api/invoices/7').flush(anInvoice());
      await advance(0);
      expect(element.textContent).toContain('Waiting for confirmation');
      expect(element.textContent).not.toContain('Pay 78.00 EUR by card');

      // The polling timer started when the page opened, 10 ms of clock ago (open() waits 10 ms).
      await advance(POLL_MS - 10 - 1);
      backend.expectNone('/api/invoices/7');
      await advance(1);
      backend.expectOne('/api/invoices/7').flush(anInvoice({ status: 'paid', paidAt: '2026-12-01T10:05:00Z', checkoutState: 'none' }));
      await advance(0);
      expect(element.textContent).toContain('Paid by card on 1 Dec 2026.');
      expect(element.querySelector('a[download]')?.getAttribute('href')).toBe('/api/invoices/7/receipt');

      await advance(POLL_MS * 5);
      backend.expectNone('/api/invoices/7');
    } finally {
      vi.useRealTimers();
    }
  });

  it('shows a cancelled payment clearly, with Pay again', async () => {
    await open('cancel');
    backend.expectOne('/api/invoices/7').flush(anInvoice());
    await settle();
    expect(element.textContent).toContain('Payment cancelled');
    expect(element.textContent).toContain('Pay 78.00 EUR by card');
  });

  it('shows a declined payment clearly, without waiting', async () => {
    await open('success');
    backend.expectOne('/api/invoices/7').flush(anInvoice({ checkoutState: 'failed' }));
    await settle();
    expect(element.textContent).toContain('Payment failed');
    expect(element.textContent).toContain('nothing was charged');
  });

  it('an invoice that cannot be found says so with Try again instead of loading forever', async () => {
    await open(null);
    flushApiError(backend.expectOne('/api/invoices/7'), 404, 'Invoice not found.');
    await settle();
    expect(element.querySelector('mat-progress-bar')).toBeNull();
    expect(element.textContent).toContain("Couldn't load the invoice");
    expect(element.textContent).toContain('Invoice not found.');
    expect(element.querySelector('[aria-current="page"]')?.textContent).toContain('Invoice');

    buttonWithText(element, 'Try again').click();
    fixture.detectChanges();
    await wait(10);
    backend.expectOne('/api/invoices/7').flush(anInvoice());
    await settle();
    expect(element.textContent).toContain('Invoice TF-2026-0001');
  });

  it("shows the server's reason when paying is refused", async () => {
    await open(null);
    backend.expectOne('/api/invoices/7').flush(anInvoice());
    await settle();
    (element.querySelector('button.mat-mdc-unelevated-button') as HTMLButtonElement).click();
    backend
      .expectOne('/api/invoices/7/checkout')
      .flush(
        { error: { code: 'invoice_not_payable', message: 'This invoice is cancelled and cannot be paid.' } },
        { status: 409, statusText: 'Conflict' },
      );
    await settle();
    expect(element.querySelector('.form-problem')?.textContent).toContain('This invoice is cancelled and cannot be paid.');
  });
});
