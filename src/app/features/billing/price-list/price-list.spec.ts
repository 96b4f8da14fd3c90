import { HttpTestingController } from '@angular/common/http/testing';
import { ComponentFixture } from '@angular/core/testing';
import { buttonWithText, flushApiError } from '../../../shared/testing/api-errors';
import { leaveGuard } from '../../../core/leave-guard';
import { PriceList } from './price-list';
import { mountPage, settlePage, typeInto, wait } from '../../../shared/testing/mount-page';
import { GAIT_PRICE } from '../../../shared/testing/billing-fixtures';

describe('PriceList', () => {
  let fixture: ComponentFixture<PriceList>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  const settle = () => settlePage(fixture);

  beforeEach(async () => {
    ({ fixture, element, backend } = mountPage(PriceList, {}));
    await wait(10);
  });
  afterEach(() => backend.verify());

  it('a failed currency load says so with Try again and still shows the prices, without throwing', async () => {
    backend.expectOne('/api/prices').flush({ prices: [GAIT_PRICE] });
    flushApiError(backend.expectOne('/api/billing/settings'), 500, 'The database is busy.');
    await settle();
    expect(element.querySelector('mat-progress-bar')).toBeNull();
    expect(element.textContent).toContain("Couldn't load the clinic's currency");
    expect(element.textContent).toContain('The database is busy.');
    expect(element.textContent).toContain('Gait assessment');
    expect(element.querySelector('app-currency-setting')).toBeNull();

    buttonWithText(element, 'Try again').click();
    await settle();
    backend.expectOne('/api/billing/settings').flush({ currency: 'EUR' });
    await settle();
    expect(element.textContent).not.toContain("Couldn't load");
    expect(element.textContent).toContain('What the clinic charges, in EUR.');
    expect(element.querySelector('app-currency-setting')).not.toBeNull();
  });

  it('a failed price list says why with Try again and the loading bar ends', async () => {
    flushApiError(backend.expectOne('/api/prices'), 503, 'The server is starting up.');
    backend.expectOne('/api/billing/settings').flush({ currency: 'EUR' });
    await settle();
    expect(element.querySelector('mat-progress-bar')).toBeNull();
    expect(element.textContent).toContain("Couldn't load the prices");
    expect(element.textContent).toContain('The server is starting up.');

    buttonWithText(element, 'Try again').click();
    await settle();
    backend.expectOne('/api/prices').flush({ prices: [GAIT_PRICE] });
    await settle();
    expect(element.textContent).not.toContain("Couldn't load");
    expect(element.textContent).toContain('Gait assessment');
  });

  it('with the network down both loads say the server cannot be reached', async () => {
    backend.expectOne('/api/prices').error(new ProgressEvent('error'), { status: 0, statusText: 'Unknown Error' });
    backend.expectOne('/api/billing/settings').error(new ProgressEvent('error'), { status: 0, statusText: 'Unknown Error' });
    await settle();
    expect(element.querySelector('mat-progress-bar')).toBeNull();
    expect(element.querySelectorAll('app-error-state').length).toBe(2);
    expect(element.textContent).toContain("Can't reach the server");
  });

  it('adds a price typed with a decimal comma at its value (12,50 → 1250 cents) and warns before leaving typed work', async () => {
    backend.expectOne('/api/prices').flush({ prices: [GAIT_PRICE] });
    backend.expectOne('/api/billing/settings').flush({ currency: 'EUR' });
    await settle();
    const page = fixture.componentInstance;
    expect(page.leaveWarning()).toBeNull();
    const type = (name: string, value: string) => typeInto(element, name, value);
    type('item', 'Short review');
    type('amount', '12,50');
    type('tax', '7,5');
    await settle();
    expect(page.leaveWarning()?.title).toBe('Leave without saving?');

    buttonWithText(element, 'Add price').click();
    const req = backend.expectOne('/api/prices');
    expect(req.request.body).toEqual({ item: 'Short review', description: '', amountMinor: 1250, taxRateBp: 750 });
    req.flush({ ...GAIT_PRICE, id: 2, item: 'Short review', amountMinor: 1250, taxRateBp: 750 });
    await settle();
    expect(page.leaveWarning()).toBeNull();
    expect(element.textContent).toContain('12.50 EUR');
  });

  it('adding again after the answer was lost sends the same Idempotency-Key (one price is made); the next new price gets its own', async () => {
    backend.expectOne('/api/prices').flush({ prices: [] });
    backend.expectOne('/api/billing/settings').flush({ currency: 'EUR' });
    await settle();
    const add = async () => {
      typeInto(element, 'item', 'Short review');
      typeInto(element, 'amount', '12,50');
      await settle();
      buttonWithText(element, 'Add price').click();
      return backend.expectOne('/api/prices');
    };
    const first = await add();
    const key = first.request.headers.get('Idempotency-Key');
    expect(key).toMatch(/^[A-Za-z0-9_-]{8,64}$/);
    first.error(new ProgressEvent('error'), { status: 0, statusText: 'Unknown Error' });
    await settle();
    buttonWithText(element, 'Add price').click();
    const again = backend.expectOne('/api/prices');
    expect(again.request.headers.get('Idempotency-Key')).toBe(key);
    again.flush({ ...GAIT_PRICE, id: 2, item: 'Short review', amountMinor: 1250, taxRateBp: null });
    await settle();
    const next = await add();
    expect(next.request.headers.get('Idempotency-Key')).not.toBe(key);
    next.flush({ ...GAIT_PRICE, id: 3, item: 'Short review', amountMinor: 1250, taxRateBp: null });
    await settle();
  });

  it('is guarded against leaving with unsaved work', async () => {
    backend.expectOne('/api/prices').flush({ prices: [] });
    backend.expectOne('/api/billing/settings').flush({ currency: 'EUR' });
    const routes = (await import('../billing.routes')).default;
    const guarded = routes.filter((r) => r.canDeactivate?.includes(leaveGuard)).map((r) => r.path);
    expect(guarded).toEqual(['prices', 'invoices/new', 'invoices/:id/edit']);
  });
});
