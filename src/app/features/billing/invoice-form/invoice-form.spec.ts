import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter, Router } from '@angular/router';
import type { Price } from '../../../../contracts/billing';
import { InvoiceForm } from './invoice-form';

const wait = (ms: number) => new Promise((r) => setTimeout(r, ms));
const PRICES: Price[] = [
  { id: 1, item: 'Gait assessment', description: '', amountMinor: 12000, currency: 'EUR', taxRateBp: 2000, archived: false },
  { id: 2, item: 'Re-test', description: '', amountMinor: 6500, currency: 'EUR', taxRateBp: 2000, archived: false },
];

describe('InvoiceForm', () => {
  let fixture: ComponentFixture<InvoiceForm>;
  let element: HTMLElement;
  let backend: HttpTestingController;
  /** The component's protected API, for driving the form the way its template does. */
  let form: any;

  /** Lets signals, resources and the form settle (no whenStable: it would wait for open requests). */
  const settle = async () => {
    await wait(20);
    fixture.detectChanges();
    await wait(10);
    fixture.detectChanges();
  };

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [InvoiceForm],
      providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([])],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(InvoiceForm);
    element = fixture.nativeElement;
    form = fixture.componentInstance;
    fixture.detectChanges();
    await wait(10);
    backend.expectOne('/api/athletes').flush({ athletes: [{ id: 4, firstName: 'Ada', lastName: 'Kestrel' }] });
    backend.expectOne('/api/prices').flush({ prices: PRICES });
    backend.expectOne('/api/billing/settings').flush({ currency: 'EUR' });
    await settle();
  });
  afterEach(() => backend.verify());

  it("billing an athlete's Re-test fills the line from the price list and previews 65.00 + 13.00 = 78.00 EUR", async () => {
    form.form.controls.athleteId.setValue(4);
    await settle();
    backend.expectOne('/api/athletes/4/assessments').flush({ assessments: [{ id: 11, athleteId: 4, date: '2026-11-24', kind: 'retest' }] });
    await settle();
    form.form.controls.assessmentId.setValue(11);
    form.pickAssessment({ id: 11, kind: 'retest' });
    await settle();
    expect(form.lines.at(0).getRawValue()).toEqual({ priceId: 2, description: 'Re-test', quantity: 1, amount: '65.00', tax: '20' });
    expect(element.querySelector('[data-testid="preview-total"]')?.textContent).toBe('78.00 EUR');
  });

  it('sends minor units and shows the server 422 under the line field', async () => {
    form.form.controls.athleteId.setValue(4);
    await settle();
    backend.expectOne('/api/athletes/4/assessments').flush({ assessments: [] });
    form.lines.at(0).setValue({ priceId: null, description: 'Taping', quantity: 3, amount: '45.00', tax: '20' });
    await settle();
    expect(element.querySelector('[data-testid="preview-total"]')?.textContent).toBe('162.00 EUR');
    void form.save();
    const req = backend.expectOne('/api/invoices');
    expect(req.request.body.lines).toEqual([{ priceId: null, description: 'Taping', quantity: 3, unitAmountMinor: 4500, taxRateBp: 2000 }]);
    req.flush(
      { error: { code: 'validation_failed', message: 'x', details: [{ path: ['lines', 0, 'unitAmountMinor'], message: 'The amount must be at most 1000000.' }] } },
      { status: 422, statusText: 'Unprocessable' },
    );
    await settle();
    expect(form.lines.at(0).controls.amount.errors).toEqual({ server: 'The amount must be at most 1000000.' });
  });

  it('opens the new draft after saving', async () => {
    const navigate = vi.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    form.form.controls.athleteId.setValue(4);
    await settle();
    backend.expectOne('/api/athletes/4/assessments').flush({ assessments: [] });
    form.pickPrice(0, 1);
    await settle();
    void form.save();
    backend.expectOne('/api/invoices').flush({ id: 31 });
    await settle();
    expect(navigate).toHaveBeenCalledWith(['/billing/invoices', 31]);
  });
});
