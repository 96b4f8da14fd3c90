import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { EraseAthleteDialog, type EraseAthleteData } from './erase-athlete-dialog';

describe('EraseAthleteDialog', () => {
  it('sends one erasure when the form is submitted twice before the answer (Enter twice, a double click)', async () => {
    const close = vi.fn();
    TestBed.configureTestingModule({
      imports: [EraseAthleteDialog],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MAT_DIALOG_DATA, useValue: { athleteId: 7, fullName: 'Ada Kestrel', keptInvoiceCount: 0 } satisfies EraseAthleteData },
        { provide: MatDialogRef, useValue: { close } },
      ],
    });
    const backend = TestBed.inject(HttpTestingController);
    const fixture = TestBed.createComponent(EraseAthleteDialog);
    fixture.detectChanges();
    await fixture.whenStable();
    const element: HTMLElement = fixture.nativeElement;
    const input = element.querySelector('input')!;
    input.value = 'Ada Kestrel';
    input.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    const form = element.querySelector('form')!;
    // Both before the page draws the button disabled.
    form.dispatchEvent(new Event('submit'));
    form.dispatchEvent(new Event('submit'));
    const req = backend.expectOne('/api/athletes/7/erasure');
    expect(req.request.body).toEqual({ confirmName: 'Ada Kestrel' });
    req.flush({ reference: 'E-7F3A', keptInvoices: 0 });
    expect(close).toHaveBeenCalledOnce();
    backend.verify();
  });
});
