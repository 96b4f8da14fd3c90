import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { CurrencySetting } from './currency-setting';

const wait = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe('CurrencySetting', () => {
  let fixture: ComponentFixture<CurrencySetting>;
  let backend: HttpTestingController;
  /** The component's protected API. */
  let setting: { control: CurrencySetting['control']; save(): Promise<void> };
  const saved: string[] = [];

  const settle = async () => {
    fixture.detectChanges();
    await wait(10);
    fixture.detectChanges();
  };
  const saveButton = () => fixture.nativeElement.querySelector('button[type="submit"]') as HTMLButtonElement;

  beforeEach(async () => {
    saved.length = 0;
    TestBed.configureTestingModule({ imports: [CurrencySetting], providers: [provideHttpClient(), provideHttpClientTesting()] });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(CurrencySetting);
    fixture.componentRef.setInput('currency', 'EUR');
    fixture.componentInstance.saved.subscribe((c) => saved.push(c));
    setting = fixture.componentInstance as unknown as typeof setting;
    await settle();
  });
  afterEach(() => backend.verify());

  it('shows the saved currency; Save is enabled only after choosing another one, then sends it', async () => {
    expect(setting.control.value).toBe('EUR');
    expect(saveButton().disabled).toBe(true);
    setting.control.setValue('GBP');
    setting.control.markAsDirty();
    await settle();
    expect(saveButton().disabled).toBe(false);
    saveButton().click(); // submits the form (ngSubmit), not a page load
    const req = backend.expectOne('/api/billing/settings');
    expect(req.request.method).toBe('PUT');
    expect(req.request.body).toEqual({ currency: 'GBP' });
    req.flush({ currency: 'GBP' });
    await settle();
    expect(saved).toEqual(['GBP']);
  });

  it("shows the server's refusal (currency in use) under the field and keeps the choice", async () => {
    setting.control.setValue('USD');
    setting.control.markAsDirty();
    await settle();
    void setting.save();
    backend
      .expectOne('/api/billing/settings')
      .flush(
        { error: { code: 'currency_in_use', message: 'Invoices already exist in the current currency; the currency cannot change now.' } },
        { status: 409, statusText: 'Conflict' },
      );
    await settle();
    expect(fixture.nativeElement.querySelector('[role="alert"]')?.textContent).toContain('Invoices already exist in the current currency');
    expect(setting.control.value).toBe('USD');
    expect(saved).toEqual([]);
    // A new choice clears the refusal.
    setting.control.setValue('CHF');
    await settle();
    expect(fixture.nativeElement.querySelector('[role="alert"]')).toBeNull();
  });
});
