import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import type { InvoiceDetail } from '../../../../contracts/billing';
import { provideIsoDateAdapter } from '../../../shared/iso-date-adapter';
import { PaymentDialog, type PaymentDialogData } from './payment-dialog';
import { DRAFT_INVOICE } from '../../../shared/testing/billing-fixtures';

const wait = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** Re-test 65.00 at 20 % = 78.00 EUR, issued. */
const ISSUED: InvoiceDetail = {
  ...DRAFT_INVOICE,
  id: 7,
  number: 'TF-2026-0003',
  status: 'issued',
  athleteId: 1,
  issuedAt: '2026-12-01T10:00:00Z',
};

describe('PaymentDialog', () => {
  let fixture: ComponentFixture<PaymentDialog>;
  let element: HTMLElement;
  let backend: HttpTestingController;
  let closed: unknown[];

  async function open(data: PaymentDialogData) {
    closed = [];
    TestBed.configureTestingModule({
      imports: [PaymentDialog],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideIsoDateAdapter(),
        { provide: MAT_DIALOG_DATA, useValue: data },
        { provide: MatDialogRef, useValue: { close: (v: unknown) => closed.push(v) } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(PaymentDialog);
    element = fixture.nativeElement;
    await fixture.whenStable();
  }
  afterEach(() => backend.verify());

  const button = (text: string) => [...element.querySelectorAll<HTMLButtonElement>('button')].find((b) => b.textContent?.includes(text))!;
  const type = (selector: string, value: string) => {
    const el = element.querySelector<HTMLInputElement | HTMLTextAreaElement>(selector)!;
    el.value = value;
    el.dispatchEvent(new Event('input'));
  };

  it('records a bank transfer with the day and the note, and closes with the paid invoice', async () => {
    await open({ invoice: ISSUED, mode: 'record' });
    type('textarea[formcontrolname="note"]', '  Transfer ref. RT-2211 ');
    type('input[formcontrolname="paidOn"]', '2026-12-03');
    button('Mark as paid').click();
    await wait(0);
    const req = backend.expectOne('/api/invoices/7/payments');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ method: 'bank_transfer', paidOn: '2026-12-03', note: 'Transfer ref. RT-2211' });
    const paid = { ...ISSUED, status: 'paid', paymentMethod: 'bank_transfer', paidOn: '2026-12-03', paymentNote: 'Transfer ref. RT-2211' };
    req.flush(paid);
    await fixture.whenStable();
    expect(closed).toEqual([paid]);
  });

  it("shows the server's 422 under the date field and keeps what was typed", async () => {
    await open({ invoice: ISSUED, mode: 'record' });
    type('textarea[formcontrolname="note"]', 'Paid at the desk');
    button('Cash').click();
    button('Mark as paid').click();
    await wait(0);
    backend.expectOne('/api/invoices/7/payments').flush(
      {
        error: {
          code: 'validation_failed',
          message: 'Check the date.',
          details: [{ path: ['paidOn'], message: 'The payment date cannot be before the invoice was issued (2026-12-01).' }],
        },
      },
      { status: 422, statusText: 'Unprocessable' },
    );
    await fixture.whenStable();
    fixture.detectChanges();
    expect(element.querySelector('mat-error')?.textContent).toContain('cannot be before the invoice was issued');
    expect(element.querySelector<HTMLTextAreaElement>('textarea[formcontrolname="note"]')!.value).toBe('Paid at the desk');
    expect(closed).toEqual([]);
  });

  it('records the refund of a cash payment with a note (no payment service)', async () => {
    await open({ invoice: { ...ISSUED, status: 'paid', paymentMethod: 'cash' }, mode: 'refund' });
    expect(element.textContent).toContain('No payment service is involved');
    expect(element.querySelector('input[formcontrolname="paidOn"]')).toBeNull();
    type('textarea[formcontrolname="note"]', 'Handed back in cash');
    button('Record refund').click();
    await wait(0);
    const req = backend.expectOne('/api/invoices/7/refund');
    expect(req.request.body).toEqual({ note: 'Handed back in cash' });
    req.flush({ ...ISSUED, status: 'refunded' });
    await fixture.whenStable();
    expect(closed).toHaveLength(1);
  });

  for (const [mode, url, label] of [
    ['record', '/api/invoices/7/payments', 'Mark as paid'],
    ['refund', '/api/invoices/7/refund', 'Record refund'],
  ] as const) {
    it(`${mode}: saving again after the answer was lost sends the same Idempotency-Key (the server answers the act it did, never a second one)`, async () => {
      await open({ invoice: mode === 'record' ? ISSUED : { ...ISSUED, status: 'paid', paymentMethod: 'cash' }, mode });
      button(label).click();
      await wait(0);
      const first = backend.expectOne(url);
      const key = first.request.headers.get('Idempotency-Key');
      expect(key).toMatch(/^[A-Za-z0-9_-]{8,64}$/);
      first.error(new ProgressEvent('error'), { status: 0, statusText: 'Unknown Error' });
      await wait(10);
      fixture.detectChanges();
      await fixture.whenStable();
      expect(closed).toEqual([]);
      button(label).click();
      await wait(0);
      const again = backend.expectOne(url);
      expect(again.request.headers.get('Idempotency-Key')).toBe(key);
      again.flush({ ...ISSUED, status: mode === 'record' ? 'paid' : 'refunded' });
      await fixture.whenStable();
      expect(closed).toHaveLength(1);
    });
  }
});
