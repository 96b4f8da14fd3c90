import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideFakeEventSource } from '../../core/fake-event-source';
import { DataExportCard } from './data-export-card';
import { flushApiError } from '../testing/api-errors';
import type { DataExport } from '../../../contracts/privacy';

describe('DataExportCard', () => {
  let fixture: ComponentFixture<DataExportCard>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  function open(): void {
    TestBed.configureTestingModule({
      imports: [DataExportCard],
      providers: [provideHttpClient(), provideHttpClientTesting(), provideFakeEventSource()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(DataExportCard);
    fixture.componentRef.setInput('athleteId', 4);
    element = fixture.nativeElement;
    fixture.detectChanges();
  }
  const settle = async () => {
    await new Promise((r) => setTimeout(r, 20));
    fixture.detectChanges();
  };
  afterEach(() => backend.verify());

  it('shows a loading bar until the exports arrive, then says when none was prepared yet', async () => {
    open();
    const req = backend.expectOne('/api/athletes/4/data-exports');
    await settle();
    expect(element.querySelector('mat-progress-bar[aria-label="Loading the exports"]')).not.toBeNull();
    req.flush({ exports: [] });
    await settle();
    expect(element.querySelector('mat-progress-bar')).toBeNull();
    expect(element.textContent).toContain('No export prepared yet.');
  });

  it('says why the exports could not be loaded and reads them again on Try again', async () => {
    open();
    flushApiError(backend.expectOne('/api/athletes/4/data-exports'), 503, 'The database is busy.');
    await settle();
    const alert = element.querySelector('[role="alert"]')!;
    expect(alert.textContent).toContain("Couldn't load the exports");
    expect(alert.textContent).toContain('The database is busy.');
    alert.querySelector('button')!.click();
    await settle();
    backend.expectOne('/api/athletes/4/data-exports').flush({ exports: [] });
    await settle();
    expect(element.querySelector('[role="alert"]')).toBeNull();
    expect(element.textContent).toContain('No export prepared yet.');
  });

  it('starts one export when the button is clicked twice before the answer', async () => {
    open();
    backend.expectOne('/api/athletes/4/data-exports').flush({ exports: [] });
    await settle();
    const button = [...element.querySelectorAll('button')].find((b) => b.textContent?.includes('Prepare'))!;
    // Both before the page draws the button disabled.
    button.click();
    button.click();
    const reqs = backend.match((r) => r.method === 'POST' && r.url === '/api/athletes/4/data-exports');
    expect(reqs).toHaveLength(1);
    const building: DataExport = {
      id: 1,
      athleteId: 4,
      status: 'building',
      progress: 0,
      error: null,
      sizeBytes: null,
      fileCount: null,
      createdAt: '2026-12-01T10:00:00Z',
      readyAt: null,
      expiresAt: null,
      downloadUrl: null,
    };
    reqs[0]!.flush(building);
    await settle();
  });
});
