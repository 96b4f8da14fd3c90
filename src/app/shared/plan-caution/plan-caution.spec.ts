import { TestBed } from '@angular/core/testing';
import { EXERCISE_LIBRARY_CAUTION, PLAN_CAUTION } from '../../../contracts/plans';
import { PlanCaution } from './plan-caution';

describe('PlanCaution', () => {
  it('speaks of "this plan" on plan pages and of the exercises on the library, where there is no plan', async () => {
    const fixture = TestBed.createComponent(PlanCaution);
    await fixture.whenStable();
    expect(fixture.nativeElement.textContent).toContain(PLAN_CAUTION);
    fixture.componentRef.setInput('for', 'library');
    await fixture.whenStable();
    expect(fixture.nativeElement.textContent).toContain(EXERCISE_LIBRARY_CAUTION);
    expect(fixture.nativeElement.textContent).not.toContain('This plan');
  });
});
