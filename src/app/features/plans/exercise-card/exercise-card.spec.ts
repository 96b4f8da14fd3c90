import { TestBed } from '@angular/core/testing';
import type { Exercise } from '../../../../contracts/plans';
import { ExerciseCard } from './exercise-card';

const ARABIC = 'تمرين الإطالة';

function exercise(name: string): Exercise {
  return {
    id: 1,
    name,
    purpose: 'Invented for the spec.',
    region: 'hamstring',
    kind: 'isometric',
    dose: { sets: 3, reps: null, holdSeconds: 30, tempo: null, load: null, restSeconds: 60, daysPerWeek: 5 },
    instructions: ['Hold.'],
    cautions: '',
    source: '',
    archived: false,
    createdAt: '',
    updatedAt: '',
  };
}

describe('ExerciseCard text direction', () => {
  it('shows the name and the coach\'s notes in the direction of their own text (dir="auto")', async () => {
    const fixture = TestBed.createComponent(ExerciseCard);
    fixture.componentRef.setInput('exercise', exercise(ARABIC));
    fixture.componentRef.setInput('notes', 'הערה של המאמן');
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;
    const name = el.querySelector('.name')!;
    expect(name.getAttribute('dir')).toBe('auto');
    expect(name.textContent?.trim()).toBe(ARABIC);
    const notes = el.querySelector('.notes')!;
    expect(notes.getAttribute('dir')).toBe('auto');
    expect(notes.textContent).toContain('הערה של המאמן');
  });
});
