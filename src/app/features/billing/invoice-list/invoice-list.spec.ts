import { HttpTestingController } from '@angular/common/http/testing';
import { ComponentFixture } from '@angular/core/testing';
import { buttonWithText, flushApiError } from '../../../shared/testing/api-errors';
import { provideIsoDateAdapter } from '../../../shared/iso-date-adapter';
import { InvoiceList } from './invoice-list';
import { mountPage, settlePage, wait } from '../../../shared/testing/mount-page';

const EMPTY = { invoices: [], totals: { count: 0, totalMinor: 0, outstandingMinor: 0, currency: 'EUR' } };

describe('InvoiceList', () => {
  let fixture: ComponentFixture<InvoiceList>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  const settle = () => settlePage(fixture);

  beforeEach(async () => {
    ({ fixture, element, backend } = mountPage(InvoiceList, {}, [provideIsoDateAdapter()]));
    await wait(10);
  });
  afterEach(() => backend.verify());

  it('the athletes for the filter failing says so with Try again and still lists the invoices, without throwing', async () => {
    backend.expectOne('/api/invoices').flush(EMPTY);
    flushApiError(backend.expectOne('/api/athletes'), 500, 'The database is busy.');
    await settle();
    expect(element.querySelector('mat-progress-bar')).toBeNull();
    expect(element.textContent).toContain("Couldn't load the athletes to filter by");
    expect(element.textContent).toContain('The database is busy.');
    expect(element.textContent).toContain('No invoices');

    buttonWithText(element, 'Try again').click();
    await settle();
    backend.expectOne('/api/athletes').flush({ athletes: [] });
    await settle();
    expect(element.textContent).not.toContain("Couldn't load");
  });

  it('a failed invoice list says why with Try again and the loading bar ends', async () => {
    flushApiError(backend.expectOne('/api/invoices'), 503, 'The server is starting up.');
    backend.expectOne('/api/athletes').flush({ athletes: [] });
    await settle();
    expect(element.querySelector('mat-progress-bar')).toBeNull();
    expect(element.textContent).toContain("Couldn't load the invoices");
    expect(element.textContent).toContain('The server is starting up.');
  });
});
