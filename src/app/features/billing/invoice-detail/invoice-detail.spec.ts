import type { HttpTestingController } from '@angular/common/http/testing';
import type { ComponentFixture } from '@angular/core/testing';
import { buttonWithText, flushApiError } from '../../../shared/testing/api-errors';
import { TestBed } from '@angular/core/testing';
import { MatDialog, type MatDialogRef } from '@angular/material/dialog';
import { of } from 'rxjs';
import { InvoiceDetailPage } from './invoice-detail';
import { DRAFT_INVOICE } from '../../../shared/testing/billing-fixtures';
import { mountPage, wait } from '../../../shared/testing/mount-page';

describe('InvoiceDetailPage', () => {
  let fixture: ComponentFixture<InvoiceDetailPage>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  const settle = async () => {
    await wait(20);
    fixture.detectChanges();
    await fixture.whenStable();
    fixture.detectChanges();
  };

  beforeEach(async () => {
    ({ fixture, element, backend } = mountPage(InvoiceDetailPage, { id: '999' }));
    await wait(10);
  });
  afterEach(() => backend.verify());

  it('an invoice that cannot be found (a mistyped or deleted one) says so with Try again, and the loading bar ends', async () => {
    flushApiError(backend.expectOne('/api/invoices/999'), 404, 'Invoice not found.');
    await settle();
    expect(element.querySelector('mat-progress-bar')).toBeNull();
    expect(element.textContent).toContain("Couldn't load the invoice");
    expect(element.textContent).toContain('Invoice not found.');
    expect(element.querySelector('[aria-current="page"]')?.textContent?.trim()).toBe('Invoice');
    buttonWithText(element, 'Try again').click();
    fixture.detectChanges();
    await wait(10);
    flushApiError(backend.expectOne('/api/invoices/999'), 404, 'Invoice not found.');
    await settle();
    expect(element.textContent).toContain("Couldn't load the invoice");
  });

  it('issue and cancel send an Idempotency-Key; doing the act again after a lost answer sends the same key, another act its own', async () => {
    const draft = DRAFT_INVOICE;
    // Answers the page's reads (the invoice, its athlete) as they come; a read left open keeps the page unstable.
    const answerReads = async () => {
      for (let i = 0; i < 3; i++) {
        await wait(10);
        fixture.detectChanges();
        backend.match('/api/invoices/999').forEach((r) => r.flush(draft));
        backend.match('/api/athletes/4').forEach((r) => r.flush({ id: 4, hasAccount: true }));
      }
    };
    await answerReads();
    vi.spyOn(TestBed.inject(MatDialog), 'open').mockReturnValue({ afterClosed: () => of(true) } as unknown as MatDialogRef<unknown>);
    const act = (a: 'issue' | 'cancel') => (fixture.componentInstance as unknown as { act(a: string, inv: unknown): void }).act(a, draft);
    const keys: Record<string, string | null> = {};
    for (const action of ['issue', 'issue', 'cancel'] as const) {
      act(action);
      await wait(0);
      const req = backend.expectOne((r) => r.url === `/api/invoices/999/${action}`);
      const key = req.request.headers.get('Idempotency-Key');
      expect(key).toMatch(/^[A-Za-z0-9_-]{8,64}$/);
      if (action in keys) expect(key).toBe(keys[action]);
      keys[action] = key;
      req.error(new ProgressEvent('error'), { status: 0, statusText: 'Unknown Error' });
      await answerReads();
    }
    expect(keys['cancel']).not.toBe(keys['issue']);
  });
});
