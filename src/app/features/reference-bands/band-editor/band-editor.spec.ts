import { leaveGuard } from '../../../core/leave-guard';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import type { ReferenceBand } from '../../../../contracts/measures';
import { BandEditor } from './band-editor';

const knee: ReferenceBand = {
  key: 'knee_flexion_initial_contact',
  low: 13.8,
  high: 21.8,
  unit: '°',
  context: 'Treadmill, preferred step rate; mean ± 1 SD',
  source: 'Heiderscheit et al. 2011, Med Sci Sports Exerc 43(2):296–302, Table 3',
  evidence: 'pub',
};

describe('BandEditor', () => {
  let fixture: ComponentFixture<BandEditor>;
  let element: HTMLElement;
  let backend: HttpTestingController;
  let changed: unknown[];

  beforeEach(async () => {
    TestBed.configureTestingModule({ imports: [BandEditor], providers: [provideHttpClient(), provideHttpClientTesting()] });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(BandEditor);
    fixture.componentRef.setInput('band', knee);
    fixture.componentRef.setInput('isDefault', true);
    changed = [];
    fixture.componentInstance.changed.subscribe((c) => changed.push(c));
    element = fixture.nativeElement;
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  const input = (label: string) =>
    [...element.querySelectorAll('mat-form-field')]
      .find((f) => f.querySelector('mat-label')?.textContent?.trim() === label)!
      .querySelector<HTMLInputElement | HTMLTextAreaElement>('input, textarea')!;
  const type = (label: string, value: string) => {
    const el = input(label);
    el.value = value;
    el.dispatchEvent(new Event('input'));
  };
  const saveButton = () => [...element.querySelectorAll<HTMLButtonElement>('button')].find((b) => b.textContent?.includes('Save band'))!;

  it('shows the default band and saves a change as the clinic band', async () => {
    expect(element.querySelector('.chip')?.textContent).toContain('Default');
    expect(saveButton().disabled).toBe(true);
    type('Upper limit', '23');
    await fixture.whenStable();
    saveButton().click();
    const req = backend.expectOne('/api/reference-bands/knee_flexion_initial_contact');
    expect(req.request.method).toBe('PUT');
    expect(req.request.body).toEqual({ ...knee, key: undefined, high: 23 } as never);
    req.flush({ ...knee, high: 23 });
    await fixture.whenStable();
    expect(changed).toEqual([{ key: knee.key, band: { ...knee, high: 23 } }]);
  });

  it('writes the unit beside each limit and says what an empty limit means', () => {
    for (const label of ['Lower limit', 'Upper limit']) {
      const field = input(label).closest('mat-form-field')!;
      expect(field.querySelector('[matTextSuffix]')?.textContent?.trim(), label).toBe('°');
      expect(field.querySelector('mat-hint')?.textContent?.trim(), label).toBe('Leave empty for no limit');
    }
  });

  it('keeps a band with the lower limit above the upper one from being sent', async () => {
    type('Lower limit', '30');
    await fixture.whenStable();
    saveButton().click();
    await fixture.whenStable();
    backend.expectNone('/api/reference-bands/knee_flexion_initial_contact');
    expect(element.textContent).toContain('The lower limit is above the upper limit.');
  });

  it('shows the server’s field problems under the fields', async () => {
    type('Source (citation)', 'x');
    await fixture.whenStable();
    saveButton().click();
    backend.expectOne('/api/reference-bands/knee_flexion_initial_contact').flush(
      {
        error: {
          code: 'validation',
          message: 'Invalid',
          details: [{ path: ['source'], message: 'Name the source (publication, or "common practice").' }],
        },
      },
      { status: 422, statusText: 'Unprocessable Entity' },
    );
    await fixture.whenStable();
    expect(element.querySelector('mat-error')?.textContent).toContain('Name the source');
  });

  it('reads a decimal comma as the decimal mark (12,5 → 12.5, not 125) and refuses a limit that is not a number', async () => {
    type('Lower limit', 'abc');
    input('Lower limit').dispatchEvent(new Event('blur'));
    await fixture.whenStable();
    saveButton().click();
    await fixture.whenStable();
    backend.expectNone('/api/reference-bands/knee_flexion_initial_contact');
    expect(element.querySelector('mat-error')?.textContent).toContain('Enter a number, e.g. 12.5 or 12,5');
    expect(input('Lower limit').value).toBe('abc');

    type('Lower limit', '12,5');
    await fixture.whenStable();
    saveButton().click();
    const req = backend.expectOne('/api/reference-bands/knee_flexion_initial_contact');
    expect(req.request.body).toMatchObject({ low: 12.5, high: 21.8 });
    req.flush({ ...knee, low: 12.5 });
    await fixture.whenStable();
  });

  it('says it holds unsaved changes from the first edit until saved or discarded', async () => {
    const editor = fixture.componentInstance;
    expect(editor.hasUnsavedChanges()).toBe(false);
    type('Upper limit', '23');
    await fixture.whenStable();
    expect(editor.hasUnsavedChanges()).toBe(true);
    [...element.querySelectorAll<HTMLButtonElement>('button')].find((b) => b.textContent?.includes('Discard changes'))!.click();
    await fixture.whenStable();
    expect(editor.hasUnsavedChanges()).toBe(false);
    expect(input('Upper limit').value).toBe('21.8');
  });

  it('The reference bands page is guarded against leaving with unsaved work', async () => {
    expect((await import('../reference-bands.routes')).default[0].canDeactivate).toEqual([leaveGuard]);
  });
});
