import { Routes } from '@angular/router';

/** `/exercises` (owner and coach): the clinic's exercise library. */
export default [
  {
    path: '',
    title: 'Exercise library · Trailframe',
    loadComponent: () => import('./exercise-library/exercise-library').then((m) => m.ExerciseLibrary),
  },
] satisfies Routes;
