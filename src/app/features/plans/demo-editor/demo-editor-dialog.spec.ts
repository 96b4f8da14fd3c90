import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MAT_DIALOG_DATA } from '@angular/material/dialog';
import type { Exercise } from '../../../../contracts/plans';
import { provideFakeEventSource } from '../../../core/fake-event-source';
import { DemoEditorDialog } from './demo-editor-dialog';
import { flushApiError, buttonWithText } from '../../../shared/testing/api-errors';

const exercise = { id: 4, name: 'Heel drop' } as Exercise;

describe('DemoEditorDialog', () => {
  let fixture: ComponentFixture<DemoEditorDialog>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [DemoEditorDialog],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideFakeEventSource(),
        { provide: MAT_DIALOG_DATA, useValue: { exercise } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(DemoEditorDialog);
    element = fixture.nativeElement;
    fixture.detectChanges();
  });
  const settle = async () => {
    await new Promise((r) => setTimeout(r, 20));
    fixture.detectChanges();
  };
  const button = (text: string) => buttonWithText(element, text);
  afterEach(() => backend.verify());

  it('shows a loading bar, then says there are no pictures yet and how to add them', async () => {
    await settle();
    expect(element.querySelector('mat-progress-bar[aria-label="Loading the pictures"]')).not.toBeNull();
    backend.expectOne('/api/exercises/4/demonstrations').flush({ exerciseId: 4, pictures: [], clip: null });
    await settle();
    expect(element.querySelector('mat-progress-bar')).toBeNull();
    expect(element.querySelector('app-empty-state')!.textContent).toContain('No pictures yet');
    expect(button('Add pictures').disabled).toBe(false);
    expect(button('Add a clip')).toBeDefined();
  });

  it("gives the server's reason when the pictures cannot be loaded, offers Try again, and adds nothing meanwhile", async () => {
    flushApiError(backend.expectOne('/api/exercises/4/demonstrations'), 503, 'The server is busy.');
    await settle();
    const alert = element.querySelector('app-error-state')!;
    expect(alert.textContent).toContain("Couldn't load the pictures and clip");
    expect(alert.textContent).toContain('The server is busy.');
    expect(button('Add pictures').disabled).toBe(true);
    expect(element.querySelector('app-demo-clip-editor')).toBeNull();
    button('Try again').click();
    await settle();
    backend.expectOne('/api/exercises/4/demonstrations').flush({ exerciseId: 4, pictures: [], clip: null });
    await settle();
    expect(element.querySelector('app-error-state')).toBeNull();
    expect(element.querySelector('app-demo-clip-editor')).not.toBeNull();
  });
});
