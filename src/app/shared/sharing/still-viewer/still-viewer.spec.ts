import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { aStill } from '../test-stills';
import { StillViewer, type StillViewerData } from './still-viewer';

describe('StillViewer', () => {
  let fixture: ComponentFixture<StillViewer>;
  let element: HTMLElement;
  const stills = [aStill({ id: 1, caption: 'First' }), aStill({ id: 2, caption: 'Second' }), aStill({ id: 3, caption: '' })];

  async function open(data: StillViewerData) {
    TestBed.configureTestingModule({
      imports: [StillViewer],
      providers: [
        { provide: MAT_DIALOG_DATA, useValue: data },
        { provide: MatDialogRef, useValue: { close: vi.fn() } },
      ],
    });
    fixture = TestBed.createComponent(StillViewer);
    element = fixture.nativeElement;
    fixture.detectChanges();
    await fixture.whenStable();
  }
  const img = () => element.querySelector('img')!;
  const pointer = (type: string, x: number, y = 100) => {
    const e = new MouseEvent(type, { clientX: x, clientY: y, bubbles: true }) as MouseEvent & { pointerId: number; pointerType: string };
    Object.assign(e, { pointerId: 1, pointerType: 'touch' });
    element.querySelector('.frame')!.dispatchEvent(e);
  };

  it('shows the still, its caption as alt text and n of m', async () => {
    await open({ stills, index: 1 });
    expect(img().getAttribute('alt')).toBe('Second');
    expect(img().getAttribute('src')).toMatch(/^\/api\/stills\/2\/image\.png\?s=/);
    expect(element.textContent).toContain('2 of 3');
  });

  it('swipes left to the next still and right to the previous; short drags do nothing', async () => {
    await open({ stills, index: 0 });
    pointer('pointerdown', 300);
    pointer('pointerup', 220);
    await fixture.whenStable();
    expect(element.textContent).toContain('2 of 3');
    pointer('pointerdown', 300);
    pointer('pointerup', 270);
    await fixture.whenStable();
    expect(element.textContent).toContain('2 of 3');
    pointer('pointerdown', 100);
    pointer('pointerup', 200);
    await fixture.whenStable();
    expect(element.textContent).toContain('1 of 3');
  });

  it('moves with the arrow keys and stops at the ends', async () => {
    await open({ stills, index: 2 });
    expect(img().getAttribute('alt')).toBe('Still of Re-test · 1 Dec 2026');
    element.dispatchEvent(new KeyboardEvent('keydown', { key: 'ArrowRight', bubbles: true }));
    await fixture.whenStable();
    expect(element.textContent).toContain('3 of 3');
    element.dispatchEvent(new KeyboardEvent('keydown', { key: 'ArrowLeft', bubbles: true }));
    await fixture.whenStable();
    expect(element.textContent).toContain('2 of 3');
    expect(element.querySelector<HTMLButtonElement>('button[aria-label="Next still"]')!.disabled).toBe(false);
  });
});
