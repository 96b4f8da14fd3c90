import { TestBed } from '@angular/core/testing';
import type { PlanChange } from '../plan-changes';
import { buttonWithText } from '../../../shared/testing/api-errors';
import { PlanConflict } from './plan-conflict';

const theirs: PlanChange[] = [
  { kind: 'added', text: 'Stage “Running drills” added with 2 exercises' },
  { kind: 'removed', text: 'Stage “Holds”: Wall press removed' },
];
const mine: PlanChange[] = [{ kind: 'changed', text: 'Title “Hamstring plan” → “Hamstring plan, week 3”' }];

describe('PlanConflict', () => {
  async function mount(their = theirs, my = mine) {
    const fixture = TestBed.createComponent(PlanConflict);
    fixture.componentRef.setInput('theirChanges', their);
    fixture.componentRef.setInput('myChanges', my);
    fixture.componentRef.setInput('savedAt', '2026-11-02T09:30:00Z');
    await fixture.whenStable();
    return { fixture, element: fixture.nativeElement as HTMLElement };
  }

  it('is announced, takes focus, and lists their save and my unsaved changes apart', async () => {
    const { element } = await mount();
    expect(element.getAttribute('role')).toBe('alert');
    expect(document.activeElement?.textContent).toContain('A colleague saved this plan after you opened it');
    const list = (id: string) =>
      [...element.querySelectorAll(`section[aria-labelledby="${id}"] li span`)].map((s) => s.textContent?.trim());
    expect(list('their-changes')).toEqual(theirs.map((c) => c.text));
    expect(list('my-changes')).toEqual(mine.map((c) => c.text));
    expect(element.textContent).toContain('Your changes are not saved yet');
  });

  it('says so when a side changed nothing to list', async () => {
    const { element } = await mount([], []);
    expect(element.textContent).toContain('Nothing that differs from the plan you opened.');
    expect(element.textContent).toContain('None.');
  });

  it('answers the two choices, and they wait while busy', async () => {
    const { fixture, element } = await mount();
    const said: string[] = [];
    fixture.componentInstance.loadTheirs.subscribe(() => said.push('theirs'));
    fixture.componentInstance.keepMine.subscribe(() => said.push('mine'));
    buttonWithText(element, 'Load their version').click();
    buttonWithText(element, 'Keep my changes').click();
    expect(said).toEqual(['theirs', 'mine']);
    fixture.componentRef.setInput('busy', true);
    await fixture.whenStable();
    expect(buttonWithText(element, 'Keep my changes').disabled).toBe(true);
    expect(buttonWithText(element, 'Load their version').disabled).toBe(true);
  });
});
