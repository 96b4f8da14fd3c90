import { leaveGuard } from '../../../core/leave-guard';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatSnackBar } from '@angular/material/snack-bar';
import { LegalDetailsForm } from './legal-details-form';

const wait = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe('LegalDetailsForm', () => {
  let fixture: ComponentFixture<LegalDetailsForm>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [LegalDetailsForm],
      providers: [provideHttpClient(), provideHttpClientTesting(), { provide: MatSnackBar, useValue: { open: () => undefined } }],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(LegalDetailsForm);
    element = fixture.nativeElement;
    fixture.detectChanges();
    await wait(0);
    backend
      .expectOne('/api/clinic/legal-details')
      .flush({ legalName: 'Larchwood Running Clinic Ltd', address: '12 Mill Lane\nLarchwood', taxNumber: '', contactLine: '' });
    await fixture.whenStable();
  });
  afterEach(() => backend.verify());

  const field = (name: string) => element.querySelector<HTMLInputElement | HTMLTextAreaElement>(`[formcontrolname="${name}"]`)!;
  const type = (name: string, value: string) => {
    field(name).value = value;
    field(name).dispatchEvent(new Event('input'));
  };
  const submit = () =>
    [...element.querySelectorAll<HTMLButtonElement>('button')].find((b) => b.textContent?.includes('Save legal details'))!.click();

  it('shows what is stored, and saves every field with PUT', async () => {
    expect(field('legalName').value).toBe('Larchwood Running Clinic Ltd');
    expect(field('address').value).toBe('12 Mill Lane\nLarchwood');
    expect(fixture.componentInstance.hasUnsavedChanges()).toBe(false);
    type('taxNumber', 'GB 123 4567 89');
    expect(fixture.componentInstance.hasUnsavedChanges()).toBe(true);
    submit();
    await wait(0);
    const req = backend.expectOne('/api/clinic/legal-details');
    expect(req.request.method).toBe('PUT');
    expect(req.request.body).toEqual({
      legalName: 'Larchwood Running Clinic Ltd',
      address: '12 Mill Lane\nLarchwood',
      taxNumber: 'GB 123 4567 89',
      contactLine: '',
    });
    req.flush(req.request.body);
    await fixture.whenStable();
    fixture.detectChanges();
    expect(element.textContent).not.toContain('Unsaved changes');
    expect(fixture.componentInstance.hasUnsavedChanges()).toBe(false);
  });

  it("does not send a form without a legal name, and shows the server's 422 under its field", async () => {
    type('legalName', '');
    submit();
    await fixture.whenStable();
    fixture.detectChanges();
    backend.expectNone('/api/clinic/legal-details');
    expect(element.querySelector('mat-error')?.textContent).toContain('Legal name is required');

    type('legalName', 'Larchwood Ltd');
    type('contactLine', 'billing@larchwood.test');
    submit();
    await wait(0);
    backend.expectOne('/api/clinic/legal-details').flush(
      {
        error: {
          code: 'validation_failed',
          message: 'Check the fields.',
          details: [{ path: ['contactLine'], message: 'Contact line: one line only.' }],
        },
      },
      { status: 422, statusText: 'Unprocessable' },
    );
    await fixture.whenStable();
    fixture.detectChanges();
    expect(element.querySelector('mat-error')?.textContent).toContain('Contact line: one line only.');
    expect(field('legalName').value).toBe('Larchwood Ltd');
  });

  it('The clinic details page is guarded against leaving with unsaved work', async () => {
    expect((await import('../clinic-settings.routes')).default[0].canDeactivate).toEqual([leaveGuard]);
  });
});
