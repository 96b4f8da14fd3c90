import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { RetentionCard } from './retention-card';
import { flushApiError, buttonWithText } from '../../../shared/testing/api-errors';

describe('RetentionCard', () => {
  let fixture: ComponentFixture<RetentionCard>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  function open(): void {
    TestBed.configureTestingModule({ imports: [RetentionCard], providers: [provideHttpClient(), provideHttpClientTesting()] });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(RetentionCard);
    element = fixture.nativeElement;
    fixture.detectChanges();
  }
  const settle = async () => {
    await new Promise((r) => setTimeout(r, 20));
    fixture.detectChanges();
  };
  const input = () => element.querySelector<HTMLInputElement>('input[name="months"]')!;
  afterEach(() => backend.verify());

  it('shows a loading bar and no field until the setting is read, then the stored months', async () => {
    open();
    const req = backend.expectOne('/api/clinic/retention');
    await settle();
    expect(element.querySelector('mat-progress-bar[aria-label="Loading the retention setting"]')).not.toBeNull();
    expect(element.querySelector('input')).toBeNull();
    req.flush({ months: 24, review: null });
    await settle();
    expect(input().value).toBe('24');
    expect(fixture.componentInstance.hasUnsavedChanges()).toBe(false);
    // Set but not listed yet: says what happens next.
    expect(element.textContent).toContain('Not checked yet');
  });

  it('says why the setting could not be loaded, with Try again', async () => {
    open();
    flushApiError(backend.expectOne('/api/clinic/retention'), 503, 'The database is busy.');
    await settle();
    expect(element.querySelector('[role="alert"]')!.textContent).toContain('The database is busy.');
    buttonWithText(element, 'Try again').click();
    await settle();
    backend.expectOne('/api/clinic/retention').flush({ months: null, review: null });
    await settle();
    expect(element.querySelector('app-error-state')).toBeNull();
    expect(input().value).toBe('');
  });

  it('a Try again that fails too keeps saying why (the server unreachable), with no field and no loading bar left', async () => {
    open();
    flushApiError(backend.expectOne('/api/clinic/retention'), 500, 'The database is busy.');
    await settle();
    buttonWithText(element, 'Try again').click();
    await settle();
    backend.expectOne('/api/clinic/retention').error(new ProgressEvent('error'), { status: 0, statusText: 'Unknown Error' });
    await settle();
    expect(element.querySelector('[role="alert"]')!.textContent).toContain("Can't reach the server");
    expect(element.querySelector('input')).toBeNull();
    expect(element.querySelector('mat-progress-bar')).toBeNull();
  });

  it('a refused value keeps what was typed and says why by the field; a failed check says why below', async () => {
    open();
    backend.expectOne('/api/clinic/retention').flush({ months: 24, review: null });
    await settle();
    input().value = '500';
    input().dispatchEvent(new Event('input'));
    await settle();
    element.querySelector<HTMLFormElement>('form')!.dispatchEvent(new Event('submit'));
    await settle();
    const put = backend.expectOne({ method: 'PUT', url: '/api/clinic/retention' });
    expect(put.request.body).toEqual({ months: 500 });
    expect(fixture.componentInstance.hasUnsavedChanges()).toBe(true);
    await settle();
    expect(element.querySelector('mat-progress-bar[aria-label="Saving the retention setting"]')).not.toBeNull();
    flushApiError(put, 422, 'Invalid', { details: [{ path: ['months'], message: 'At most 120 months.' }] });
    await settle();
    expect(element.querySelector('mat-hint[role="alert"]')!.textContent).toContain('At most 120 months.');
    expect(input().value).toBe('500');
    expect(input().disabled).toBe(false);
    // Refused: still unsaved, so leaving the page asks first.
    expect(fixture.componentInstance.hasUnsavedChanges()).toBe(true);

    buttonWithText(element, 'Check now').click();
    flushApiError(backend.expectOne({ method: 'POST', url: '/api/clinic/retention/reviews' }), 409, 'The check is already running.');
    await settle();
    expect(element.querySelector('p.problem[role="alert"]')!.textContent).toContain('The check is already running.');
    expect(input().value).toBe('500');
  });

  it('refuses months typed as 0,5 or 12e by the field without sending them (they became 5 months or "off"); empty turns it off', async () => {
    open();
    backend.expectOne('/api/clinic/retention').flush({ months: 24, review: null });
    await settle();
    expect(input().getAttribute('inputmode')).toBe('numeric');
    for (const typed of ['0,5', '12e', '-3']) {
      input().value = typed;
      input().dispatchEvent(new Event('input'));
      await settle();
      element.querySelector<HTMLFormElement>('form')!.dispatchEvent(new Event('submit'));
      await settle();
      backend.expectNone({ method: 'PUT', url: '/api/clinic/retention' });
      expect(element.querySelector('mat-hint[role="alert"]')!.textContent).toContain('Enter whole months from 1 to 120');
      expect(input().value).toBe(typed);
    }
    input().value = '';
    input().dispatchEvent(new Event('input'));
    await settle();
    element.querySelector<HTMLFormElement>('form')!.dispatchEvent(new Event('submit'));
    await settle();
    const put = backend.expectOne({ method: 'PUT', url: '/api/clinic/retention' });
    expect(put.request.body).toEqual({ months: null });
    put.flush({ months: null, review: null });
    await settle();
  });
});
