import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter, Router, withComponentInputBinding } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import type { Assessment } from '../../../../contracts/api';
import type { InvoiceDetail, Price } from '../../../../contracts/billing';
import { toIsoDate } from '../../../shared/dates';
import { buttonWithText, flushApiError } from '../../../shared/testing/api-errors';
import { provideIsoDateAdapter } from '../../../shared/iso-date-adapter';
import { InvoiceForm } from './invoice-form';
import { mountPage, settlePage, typeInto, wait } from '../../../shared/testing/mount-page';
import { errorText } from '../../../shared/forms/error-text';
import { DRAFT_INVOICE, GAIT_PRICE, RETEST_PRICE, retestLine } from '../../../shared/testing/billing-fixtures';

/** The component's protected API, for driving the form the way its template does. */
interface FormApi {
  form: InvoiceForm['form'];
  lines: InvoiceForm['lines'];
  pickPrice(i: number, priceId: number | null): void;
  pickAssessment(a: Pick<Assessment, 'id' | 'kind'> | null): void;
  save(): Promise<void>;
}
const PRICES: Price[] = [GAIT_PRICE, RETEST_PRICE];

describe('InvoiceForm', () => {
  let fixture: ComponentFixture<InvoiceForm>;
  let element: HTMLElement;
  let backend: HttpTestingController;
  let form: FormApi;

  /** Lets signals, resources and the form settle (no whenStable: it would wait for open requests). */
  const settle = () => settlePage(fixture);

  beforeEach(async () => {
    ({ fixture, element, backend } = mountPage(InvoiceForm, {}, [provideIsoDateAdapter()]));
    form = fixture.componentInstance as unknown as FormApi;
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

  it('reads a quantity typed as "1,5" as one and a half and refuses it (a number field took it as 15), and "3" as 3', async () => {
    form.form.controls.athleteId.setValue(4);
    await settle();
    backend.expectOne('/api/athletes/4/assessments').flush({ assessments: [] });
    form.lines.at(0).patchValue({ description: 'Taping', amount: '45.00', tax: '20' });
    typeInto(element, 'quantity', '1,5');
    await settle();
    const quantity = form.lines.at(0).controls.quantity;
    expect(quantity.value).toBe(1.5);
    expect(errorText(quantity, 'Quantity')).toBe('Quantity must be a whole number');
    await form.save();
    backend.expectNone('/api/invoices');
    typeInto(element, 'quantity', '3');
    await settle();
    expect(quantity.value).toBe(3);
    expect(element.querySelector('[data-testid="preview-total"]')?.textContent).toBe('162.00 EUR');
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
      {
        error: {
          code: 'validation_failed',
          message: 'x',
          details: [{ path: ['lines', 0, 'unitAmountMinor'], message: 'The amount must be at most 1000000.' }],
        },
      },
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
    form.form.markAsDirty();
    await settle();
    // Typed and not saved: leaving asks first.
    expect(fixture.componentInstance.leaveWarning()?.title).toBe('Leave without saving?');
    void form.save();
    backend.expectOne('/api/invoices').flush({ id: 31 });
    await settle();
    expect(navigate).toHaveBeenCalledWith(['/billing/invoices', 31]);
    // Saved: opening the invoice does not ask.
    expect(fixture.componentInstance.leaveWarning()).toBeNull();
  });

  it('saving again after the answer was lost sends the same Idempotency-Key (the server answers the draft it made); one request per click', async () => {
    vi.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    form.form.controls.athleteId.setValue(4);
    await settle();
    backend.expectOne('/api/athletes/4/assessments').flush({ assessments: [] });
    form.pickPrice(0, 1);
    await settle();
    void form.save();
    void form.save();
    const first = backend.expectOne('/api/invoices');
    const key = first.request.headers.get('Idempotency-Key');
    expect(key).toMatch(/^[A-Za-z0-9_-]{8,64}$/);
    first.error(new ProgressEvent('error'), { status: 0, statusText: 'Unknown Error' });
    await settle();
    void form.save();
    const again = backend.expectOne('/api/invoices');
    expect(again.request.headers.get('Idempotency-Key')).toBe(key);
    again.flush({ id: 31 });
    await settle();
  });
});

describe('InvoiceForm reached by address', () => {
  let harness: RouterTestingHarness;
  let backend: HttpTestingController;
  let form: FormApi;

  const settle = async () => {
    await wait(20);
    harness.detectChanges();
    await wait(10);
    harness.detectChanges();
  };

  const DRAFT: InvoiceDetail = {
    ...DRAFT_INVOICE,
    id: 31,
    totalMinor: 15600,
    createdAt: '2026-12-01T10:00:00Z',
    assessmentId: 11,
    assessment: { id: 11, kind: 'retest', date: '2026-11-24' },
    note: 'Two visits',
    clinicName: 'Test clinic',
    subtotalMinor: 13000,
    taxMinor: 2600,
    lines: [retestLine(7, 2)],
  };

  async function open(url: string): Promise<void> {
    TestBed.configureTestingModule({
      providers: [
        provideIsoDateAdapter(),
        provideHttpClient(),
        provideHttpClientTesting(),
        provideRouter(
          [
            { path: 'billing/invoices/new', component: InvoiceForm },
            { path: 'billing/invoices/:id/edit', component: InvoiceForm },
            { path: '**', children: [] },
          ],
          withComponentInputBinding(),
        ),
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    harness = await RouterTestingHarness.create();
    form = (await harness.navigateByUrl(url, InvoiceForm)) as unknown as FormApi;
    await wait(10);
    backend.expectOne('/api/athletes').flush({ athletes: [{ id: 4, firstName: 'Ada', lastName: 'Kestrel' }] });
    backend.expectOne('/api/prices').flush({ prices: PRICES });
    backend.expectOne('/api/billing/settings').flush({ currency: 'EUR' });
  }
  afterEach(() => backend.verify());

  it('"Invoice this visit" (?athlete=4&assessment=11) chooses the athlete, the Re-test and its price: 65.00 + 13.00 = 78.00 EUR', async () => {
    await open('/billing/invoices/new?athlete=4&assessment=11');
    await settle();
    backend.expectOne('/api/athletes/4/assessments').flush({
      assessments: [
        { id: 10, athleteId: 4, date: '2026-10-01', kind: 'baseline' },
        { id: 11, athleteId: 4, date: '2026-11-24', kind: 'retest' },
      ],
    });
    await settle();
    expect(form.form.getRawValue()).toMatchObject({ athleteId: 4, assessmentId: 11 });
    expect(form.lines.at(0).getRawValue()).toEqual({ priceId: 2, description: 'Re-test', quantity: 1, amount: '65.00', tax: '20' });
    expect(harness.routeNativeElement!.querySelector('[data-testid="preview-total"]')?.textContent).toBe('78.00 EUR');
  });

  it('edits a draft: filled from the server, sends PUT with minor units, opens the invoice', async () => {
    await open('/billing/invoices/31/edit');
    const navigate = vi.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    backend.expectOne('/api/invoices/31').flush(DRAFT);
    await settle();
    backend.expectOne('/api/athletes/4/assessments').flush({ assessments: [{ id: 11, athleteId: 4, date: '2026-11-24', kind: 'retest' }] });
    await settle();
    const el = harness.routeNativeElement!;
    expect(el.querySelector('h1')?.textContent).toContain('Edit draft invoice');
    expect(form.form.getRawValue()).toMatchObject({ athleteId: 4, assessmentId: 11, note: 'Two visits' });
    expect(toIsoDate(form.form.getRawValue().dueDate)).toBe('2026-12-31');
    expect(el.querySelector('[data-testid="preview-total"]')?.textContent).toBe('156.00 EUR');
    // 3 × 65.00 at 20 % = 195.00 + 39.00 = 234.00
    form.lines.at(0).controls.quantity.setValue(3);
    await settle();
    expect(el.querySelector('[data-testid="preview-total"]')?.textContent).toBe('234.00 EUR');
    void form.save();
    const req = backend.expectOne('/api/invoices/31');
    expect(req.request.method).toBe('PUT');
    expect(req.request.body).toEqual({
      athleteId: 4,
      assessmentId: 11,
      dueDate: '2026-12-31',
      note: 'Two visits',
      lines: [{ priceId: 2, description: 'Re-test', quantity: 3, unitAmountMinor: 6500, taxRateBp: 2000 }],
    });
    req.flush({ ...DRAFT, totalMinor: 23400 });
    await settle();
    expect(navigate).toHaveBeenCalledWith(['/billing/invoices', 31]);
  });

  it("a draft issued meanwhile: the server's 409 shows above the form and what was typed stays", async () => {
    await open('/billing/invoices/31/edit');
    backend.expectOne('/api/invoices/31').flush(DRAFT);
    await settle();
    backend.expectOne('/api/athletes/4/assessments').flush({ assessments: [] });
    form.form.controls.note.setValue('Changed note');
    await settle();
    void form.save();
    backend.expectOne('/api/invoices/31').flush(
      {
        error: {
          code: 'invoice_not_draft',
          message: 'Only a draft can be edited; invoice TF-2026-0007 is issued. Cancel it and make a new one instead.',
        },
      },
      { status: 409, statusText: 'Conflict' },
    );
    await settle();
    expect(harness.routeNativeElement!.querySelector('.form-problem')?.textContent).toContain('invoice TF-2026-0007 is issued');
    expect(form.form.controls.note.value).toBe('Changed note');
  });

  it('an invoice that is no longer a draft is not offered for editing', async () => {
    await open('/billing/invoices/31/edit');
    backend.expectOne('/api/invoices/31').flush({ ...DRAFT, status: 'issued', number: 'TF-2026-0007' });
    await settle();
    const el = harness.routeNativeElement!;
    expect(el.querySelector('form')).toBeNull();
    expect(el.querySelector('.form-problem')?.textContent).toContain('Invoice TF-2026-0007 is issued; only drafts can be edited.');
  });

  it('"Invoice this visit" when the athlete\'s assessments cannot be loaded says so with Try again, then chooses the visit', async () => {
    await open('/billing/invoices/new?athlete=4&assessment=11');
    await settle();
    flushApiError(backend.expectOne('/api/athletes/4/assessments'), 500, 'The database is busy.');
    await settle();
    const el = harness.routeNativeElement!;
    expect(el.querySelector('app-error-state')?.textContent).toContain("Couldn't load the athlete's assessments");
    expect(el.querySelector('app-error-state')?.textContent).toContain('The database is busy.');
    expect(el.querySelector('form')).not.toBeNull();

    buttonWithText(el, 'Try again').click();
    await settle();
    backend.expectOne('/api/athletes/4/assessments').flush({ assessments: [{ id: 11, athleteId: 4, date: '2026-11-24', kind: 'retest' }] });
    await settle();
    expect(el.querySelector('app-error-state')).toBeNull();
    expect(form.form.getRawValue()).toMatchObject({ athleteId: 4, assessmentId: 11 });
  });

  it('a draft that cannot be found (mistyped or deleted) says so with Try again, and the loading bar ends', async () => {
    await open('/billing/invoices/999/edit');
    flushApiError(backend.expectOne('/api/invoices/999'), 404, 'Invoice not found.');
    await settle();
    const el = harness.routeNativeElement!;
    expect(el.querySelector('mat-progress-bar')).toBeNull();
    expect(el.textContent).toContain("Couldn't load the draft");
    expect(el.textContent).toContain('Invoice not found.');
    expect(el.querySelector('form')).toBeNull();
  });
});

describe('InvoiceForm when its lists cannot be loaded', () => {
  let fixture: ComponentFixture<InvoiceForm>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  const settle = () => settlePage(fixture);

  beforeEach(async () => {
    ({ fixture, element, backend } = mountPage(InvoiceForm, {}, [provideIsoDateAdapter()]));
    await wait(10);
  });
  afterEach(() => backend.verify());

  it('the network down: one sentence names what failed, the form stays, and Try again loads the lists', async () => {
    const down = { status: 0, statusText: 'Unknown Error' };
    backend.expectOne('/api/athletes').error(new ProgressEvent('error'), down);
    backend.expectOne('/api/prices').error(new ProgressEvent('error'), down);
    backend.expectOne('/api/billing/settings').error(new ProgressEvent('error'), down);
    await settle();
    const state = element.querySelector('app-error-state');
    expect(state?.textContent).toContain("Couldn't load the athletes, the price list and the clinic's currency");
    expect(state?.textContent).toContain("Can't reach the server");
    expect(element.querySelector('form')).not.toBeNull();

    buttonWithText(element, 'Try again').click();
    await settle();
    backend.expectOne('/api/athletes').flush({ athletes: [{ id: 4, firstName: 'Ada', lastName: 'Kestrel' }] });
    backend.expectOne('/api/prices').flush({ prices: PRICES });
    backend.expectOne('/api/billing/settings').flush({ currency: 'EUR' });
    await settle();
    expect(element.querySelector('app-error-state')).toBeNull();
  });

  it('a failed price list leaves custom lines working and says why', async () => {
    backend.expectOne('/api/athletes').flush({ athletes: [{ id: 4, firstName: 'Ada', lastName: 'Kestrel' }] });
    flushApiError(backend.expectOne('/api/prices'), 500, 'The database is busy.');
    backend.expectOne('/api/billing/settings').flush({ currency: 'EUR' });
    await settle();
    expect(element.querySelector('app-error-state')?.textContent).toContain("Couldn't load the price list");
    const form = fixture.componentInstance as unknown as FormApi;
    form.pickPrice(0, 2);
    form.pickAssessment({ id: 11, kind: 'retest' });
    form.lines.at(0).setValue({ priceId: null, description: 'Taping', quantity: 1, amount: '45.00', tax: '' });
    await settle();
    expect(element.querySelector('[data-testid="preview-total"]')?.textContent).toBe('45.00 EUR');
  });
});
