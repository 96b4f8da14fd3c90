import type { HttpTestingController } from '@angular/common/http/testing';
import type { ComponentFixture } from '@angular/core/testing';
import { buttonWithText, flushApiError } from '../../../shared/testing/api-errors';
import { InvoiceDetailPage } from './invoice-detail';
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
});
