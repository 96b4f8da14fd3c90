import { ChangeDetectionStrategy, Component } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { HttpErrorResponse } from '@angular/common/http';
import { Subject, throwError } from 'rxjs';
import { actionTracker } from './action-tracker';

@Component({ selector: 'app-host', template: '', changeDetection: ChangeDetectionStrategy.OnPush })
class Host {
  readonly actions = actionTracker<string>();
}

describe('ActionTracker', () => {
  function make() {
    return TestBed.createComponent(Host).componentInstance.actions;
  }

  it('marks a key pending while its request is on the way, and answers with the result', async () => {
    const actions = make();
    const answer = new Subject<number>();
    const done = actions.run('still-1', answer);
    expect(actions.isPending('still-1')).toBe(true);
    expect(actions.isPending('still-2')).toBe(false);
    answer.next(7);
    expect(await done).toBe(7);
    expect(actions.isPending('still-1')).toBe(false);
  });

  it('keeps the error message of a failed request on its key until that key acts again', async () => {
    const actions = make();
    const failure = new HttpErrorResponse({ status: 409, error: { error: { code: 'x', message: 'Still rendering.' } } });
    expect(
      await actions.run(
        'clip',
        throwError(() => failure),
      ),
    ).toBeNull();
    expect(actions.problems()['clip']).toBe('Still rendering.');
    expect(actions.isPending('clip')).toBe(false);
    const again = new Subject<boolean>();
    const next = actions.run('clip', again);
    expect(actions.problems()['clip']).toBeUndefined();
    again.next(true);
    expect(await next).toBe(true);
  });
});
