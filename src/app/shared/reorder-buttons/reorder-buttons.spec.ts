import { ChangeDetectionStrategy, Component, signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { ReorderButtons } from './reorder-buttons';

@Component({
  imports: [ReorderButtons],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `<app-reorder-buttons
    [label]="label()"
    [first]="first()"
    [last]="last()"
    removeIcon="delete"
    (moveUp)="said.push('up')"
    (moveDown)="said.push('down')"
    (remove)="said.push('remove')"
  />`,
})
class Host {
  readonly label = signal('stage 2');
  readonly first = signal(false);
  readonly last = signal(false);
  readonly said: string[] = [];
}

describe('ReorderButtons', () => {
  async function mount() {
    const fixture = TestBed.createComponent(Host);
    await fixture.whenStable();
    const element = fixture.nativeElement as HTMLElement;
    const buttons = () => [...element.querySelectorAll<HTMLButtonElement>('button')];
    return { fixture, element, buttons };
  }

  it('labels each button with the entry, and says which was pressed', async () => {
    const { fixture, buttons } = await mount();
    expect(buttons().map((b) => b.getAttribute('aria-label'))).toEqual(['Move stage 2 up', 'Move stage 2 down', 'Remove stage 2']);
    expect(buttons()[2]!.textContent?.trim()).toBe('delete');
    buttons().forEach((b) => b.click());
    expect(fixture.componentInstance.said).toEqual(['up', 'down', 'remove']);
  });

  it('the first cannot move up and the last cannot move down; remove stays available', async () => {
    const { fixture, buttons } = await mount();
    fixture.componentInstance.first.set(true);
    fixture.componentInstance.last.set(true);
    fixture.componentInstance.label.set('Bridge hold');
    await fixture.whenStable();
    expect(buttons().map((b) => b.disabled)).toEqual([true, true, false]);
    expect(buttons()[2]!.getAttribute('aria-label')).toBe('Remove Bridge hold');
  });
});
