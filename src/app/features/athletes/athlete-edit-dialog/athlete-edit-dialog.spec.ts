import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import type { AthleteDetail } from '../../../../contracts/api';
import { provideIsoDateAdapter } from '../../../shared/iso-date-adapter';
import { flushApiError } from '../../../shared/testing/api-errors';
import { AthleteEditDialog } from './athlete-edit-dialog';

const wait = (ms: number) => new Promise((r) => setTimeout(r, ms));
const athlete = {
  id: 4,
  firstName: 'Ada',
  lastName: 'Kestrel',
  email: 'ada@runner.test',
  dateOfBirth: null,
  coachId: 2,
  coachName: 'Tobin Example',
  notes: null,
} as unknown as AthleteDetail;

describe('AthleteEditDialog', () => {
  let fixture: ComponentFixture<AthleteEditDialog>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [AthleteEditDialog],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideIsoDateAdapter(),
        { provide: MAT_DIALOG_DATA, useValue: athlete },
        { provide: MatDialogRef, useValue: { close: () => undefined } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(AthleteEditDialog);
    element = fixture.nativeElement;
    fixture.detectChanges();
    await wait(10);
  });
  afterEach(() => backend.verify());

  it('a coach list that fails to load says why by the Coach field, and the current coach stays chosen', async () => {
    flushApiError(backend.expectOne('/api/coaches'), 500, 'The database is busy.');
    await wait(20);
    fixture.detectChanges();
    expect(element.textContent).toContain("Couldn't load the coach list (The database is busy.); the current coach stays.");
    expect(element.textContent).toContain('Tobin Example');
  });
});
