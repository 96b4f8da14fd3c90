import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { CAPTION_MAX } from '../../../../contracts/sharing';
import { aStill } from '../test-stills';
import { SaveStillDialog, type SaveStillData } from './save-still-dialog';

describe('SaveStillDialog', () => {
  let fixture: ComponentFixture<SaveStillDialog>;
  let element: HTMLElement;
  let backend: HttpTestingController;
  let close: ReturnType<typeof vi.fn>;

  function open(data: SaveStillData) {
    close = vi.fn();
    TestBed.configureTestingModule({
      imports: [SaveStillDialog],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MAT_DIALOG_DATA, useValue: data },
        { provide: MatDialogRef, useValue: { close } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(SaveStillDialog);
    element = fixture.nativeElement;
    fixture.detectChanges();
  }
  afterEach(() => backend.verify());

  const caption = () => element.querySelector<HTMLTextAreaElement>('textarea[name="caption"]')!;
  const type = async (text: string) => {
    caption().value = text;
    caption().dispatchEvent(new Event('input'));
    await fixture.whenStable();
  };
  const saveButton = () => element.querySelector<HTMLButtonElement>('button[type="submit"]')!;

  it('posts the frame, trimmed caption and angles, and closes with the still', async () => {
    open({ clipId: 7, frameIndex: 41, what: 'Frame 41', showAngles: false });
    await type('  Hip at toe-off  ');
    expect(element.textContent).toContain(`14 / ${CAPTION_MAX}`);
    saveButton().click();
    const req = backend.expectOne('/api/clips/7/stills');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ frameIndex: 41, caption: 'Hip at toe-off', showAngles: false, pairWith: null });
    const still = aStill({ status: 'rendering', progress: 0 });
    req.flush(still, { status: 202, statusText: 'Accepted' });
    await fixture.whenStable();
    expect(close).toHaveBeenCalledWith(still);
  });

  it('sends the pair, baseline as pairWith', async () => {
    open({ clipId: 7, frameIndex: 41, pairWith: { clipId: 3, frameIndex: 38 }, what: 'Side by side' });
    saveButton().click();
    const req = backend.expectOne('/api/clips/7/stills');
    expect(req.request.body.pairWith).toEqual({ clipId: 3, frameIndex: 38 });
    req.flush(aStill({ kind: 'pair' }));
    await fixture.whenStable();
  });

  it('refuses a caption over the limit before sending', async () => {
    open({ clipId: 7, frameIndex: 41, what: 'Frame 41' });
    await type('x'.repeat(CAPTION_MAX + 3));
    expect(saveButton().disabled).toBe(true);
    expect(element.querySelector('[role="alert"]')?.textContent).toContain('3 characters over the limit');
    backend.expectNone('/api/clips/7/stills');
  });

  it('keeps the typed caption when the server refuses it, and shows why', async () => {
    open({ clipId: 7, frameIndex: 41, what: 'Frame 41' });
    await type('Knee over the ankle');
    saveButton().click();
    backend.expectOne('/api/clips/7/stills').flush(
      {
        error: {
          code: 'validation',
          message: 'Check the fields',
          details: [{ path: ['caption'], message: 'The caption has a character that cannot be drawn' }],
        },
      },
      { status: 422, statusText: 'Unprocessable' },
    );
    await fixture.whenStable();
    expect(close).not.toHaveBeenCalled();
    expect(caption().value).toBe('Knee over the ankle');
    expect(element.textContent).toContain('The caption has a character that cannot be drawn');
  });

  it('says so when the clip is gone', async () => {
    open({ clipId: 7, frameIndex: 41, what: 'Frame 41' });
    await type('Still here');
    saveButton().click();
    backend
      .expectOne('/api/clips/7/stills')
      .flush({ error: { code: 'not_found', message: 'This clip was deleted.' } }, { status: 404, statusText: 'Not Found' });
    await fixture.whenStable();
    expect(element.querySelector('.form-problem')?.textContent).toContain('This clip was deleted.');
    expect(caption().value).toBe('Still here');
  });
});
