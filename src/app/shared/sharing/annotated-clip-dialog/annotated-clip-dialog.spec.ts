import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { AnnotatedClipDialog, type AnnotatedClipDialogData } from './annotated-clip-dialog';

describe('AnnotatedClipDialog', () => {
  let fixture: ComponentFixture<AnnotatedClipDialog>;
  let element: HTMLElement;
  let backend: HttpTestingController;
  let close: ReturnType<typeof vi.fn>;

  function open(data: AnnotatedClipDialogData) {
    close = vi.fn();
    TestBed.configureTestingModule({
      imports: [AnnotatedClipDialog],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MAT_DIALOG_DATA, useValue: data },
        { provide: MatDialogRef, useValue: { close } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(AnnotatedClipDialog);
    element = fixture.nativeElement;
    fixture.detectChanges();
  }
  afterEach(() => backend.verify());

  const single: AnnotatedClipDialogData = { mode: 'single', clipId: 7, frameCount: 2000, fps: 60, from: 18, to: 102, what: 'Baseline' };
  const input = (name: string) => element.querySelector<HTMLInputElement>(`input[name="${name}"]`)!;
  const set = async (name: string, value: string) => {
    input(name).value = value;
    input(name).dispatchEvent(new Event('input'));
    await fixture.whenStable();
  };
  const submit = () => element.querySelector<HTMLButtonElement>('button[type="submit"]')!;

  it('starts at the range it was given, says how long it plays, and posts range, speed, caption and angles', async () => {
    open(single);
    expect(input('fromFrame').value).toBe('18');
    expect(input('toFrame').value).toBe('102');
    // 85 frames of 60 fps at 1/4: 85 ÷ 15 = 5.67 s.
    expect(element.textContent).toContain('85 frames → 5.7 s at 1/4 speed');
    const caption = element.querySelector<HTMLTextAreaElement>('textarea[name="caption"]')!;
    caption.value = '  Watch the hip  ';
    caption.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    submit().click();
    const req = backend.expectOne('/api/clips/7/annotated-clips');
    expect(req.request.body).toEqual({ fromFrame: 18, toFrame: 102, factor: 0.25, caption: 'Watch the hip', showAngles: true });
    req.flush({ id: 1, status: 'rendering' }, { status: 202, statusText: 'Accepted' });
    await fixture.whenStable();
    expect(close).toHaveBeenCalledWith({ id: 1, status: 'rendering' });
  });

  it('refuses more than 1,000 frames before sending, with the limit', async () => {
    open(single);
    await set('toFrame', '1018');
    expect(submit().disabled).toBe(true);
    expect(element.textContent).toContain('That range has 1001 frames; an annotated clip can cover at most 1000.');
    backend.expectNone('/api/clips/7/annotated-clips');
  });

  it('posts a side-by-side clip of both visits, and shows the server’s reason when it refuses', async () => {
    open({ mode: 'side_by_side', athleteId: 4, baselineClipId: 3, retestClipId: 9, what: 'Side by side' });
    expect(input('fromFrame')).toBeNull();
    submit().click();
    const req = backend.expectOne('/api/athletes/4/side-by-side-clips');
    expect(req.request.body).toEqual({ baselineClipId: 3, retestClipId: 9, factor: 0.25, caption: '', showAngles: true });
    req.flush(
      { error: { code: 'no_initial_contacts', message: 'Side by side needs initial contacts of the same side marked on both clips.' } },
      { status: 422, statusText: 'Unprocessable' },
    );
    await fixture.whenStable();
    expect(close).not.toHaveBeenCalled();
    expect(element.querySelector('.form-problem')?.textContent).toContain('needs initial contacts');
  });
});
