import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import type { SessionUser } from '../../../../contracts/api';
import { ConfigStore } from '../../../core/config-store';
import { SignIn } from './sign-in';

const coach: SessionUser = {
  id: 2,
  email: 'coach@clinic.test',
  name: 'Test Coach',
  role: 'coach',
  clinicId: 1,
  clinicName: 'Test Clinic',
  athleteId: null,
};

describe('SignIn', () => {
  let fixture: ComponentFixture<SignIn>;
  let element: HTMLElement;
  let backend: HttpTestingController;
  let router: Router;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [SignIn],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: ConfigStore, useValue: { demoMode: signal(false) } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    router = TestBed.inject(Router);
    vi.spyOn(router, 'navigateByUrl').mockResolvedValue(true);
    fixture = TestBed.createComponent(SignIn);
    element = fixture.nativeElement;
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  function type(name: string, value: string) {
    const input = element.querySelector<HTMLInputElement>(`input[formcontrolname="${name}"]`)!;
    input.value = value;
    input.dispatchEvent(new Event('input'));
  }

  const submit = () => element.querySelector<HTMLButtonElement>('button[type="submit"]')!.click();

  it('shows field errors and sends nothing when fields are empty or malformed', async () => {
    type('email', 'not-an-address');
    submit();
    await fixture.whenStable();
    expect(element.textContent).toContain('Enter a valid e-mail address');
    expect(element.textContent).toContain('Password is required');
    backend.expectNone('/api/auth/sign-in');
  });

  it("shows the server's message inline on 401", async () => {
    type('email', 'coach@clinic.test');
    type('password', 'wrong password here');
    submit();
    backend
      .expectOne('/api/auth/sign-in')
      .flush(
        { error: { code: 'invalid_credentials', message: 'E-mail or password is wrong.' } },
        { status: 401, statusText: 'Unauthorized' },
      );
    await fixture.whenStable();
    expect(element.querySelector('[role="alert"]')?.textContent).toContain('E-mail or password is wrong.');
    expect(router.navigateByUrl).not.toHaveBeenCalled();
  });

  it('goes to the returnUrl after signing in', async () => {
    fixture.componentRef.setInput('returnUrl', '/athletes/4');
    type('email', 'coach@clinic.test');
    type('password', 'correct password');
    submit();
    const req = backend.expectOne('/api/auth/sign-in');
    expect(req.request.body).toEqual({ email: 'coach@clinic.test', password: 'correct password' });
    req.flush({ user: coach });
    await Promise.resolve();
    await fixture.whenStable();
    backend.expectOne('/api/auth/csrf').flush({ token: 't' });
    await new Promise((resolve) => setTimeout(resolve));
    expect(router.navigateByUrl).toHaveBeenCalledWith('/athletes/4');
  });
});

describe('SignIn in demo mode', () => {
  it('the demo note hides its icon from screen readers (it would read out "science")', async () => {
    TestBed.configureTestingModule({
      imports: [SignIn],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: ConfigStore, useValue: { demoMode: signal(true), demoInboxUrl: signal(null) } },
      ],
    });
    const fixture = TestBed.createComponent(SignIn);
    await fixture.whenStable();
    const note = (fixture.nativeElement as HTMLElement).querySelector('.demo-note')!;
    expect(note.textContent).toContain('Demo sign-ins are printed by npm start');
    expect(note.querySelector('mat-icon')!.getAttribute('aria-hidden')).toBe('true');
  });
});
