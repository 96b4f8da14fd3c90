import { Observable, firstValueFrom, of } from 'rxjs';
import { LeaveWarning, UNSAVED_CHANGES_WARNING, leaveDecision, warnBeforeUnload } from './leave-guard';

describe('leaveDecision', () => {
  it('lets the user leave without asking when nothing would be lost', () => {
    const ask = vi.fn(() => of(false));
    expect(leaveDecision({ leaveWarning: () => null }, ask)).toBe(true);
    expect(leaveDecision(null, ask)).toBe(true);
    expect(leaveDecision({}, ask)).toBe(true); // a page without the hook
    expect(ask).not.toHaveBeenCalled();
  });

  it('asks with the page’s own warning and follows the answer', async () => {
    const asked: LeaveWarning[] = [];
    const page = { leaveWarning: () => UNSAVED_CHANGES_WARNING };
    const stay = leaveDecision(page, (w) => (asked.push(w), of(false)));
    expect(stay).not.toBe(true);
    expect(await firstValueFrom(stay as Observable<boolean>)).toBe(false);
    const leave = leaveDecision(page, () => of(true));
    expect(await firstValueFrom(leave as Observable<boolean>)).toBe(true);
    expect(asked).toEqual([UNSAVED_CHANGES_WARNING]);
  });

  it('reads the page state at the moment of leaving', () => {
    let dirty = false;
    const page = { leaveWarning: () => (dirty ? UNSAVED_CHANGES_WARNING : null) };
    const ask = () => of(true);
    expect(leaveDecision(page, ask)).toBe(true);
    dirty = true;
    expect(leaveDecision(page, ask)).not.toBe(true);
  });
});

describe('warnBeforeUnload', () => {
  it('cancels the unload only while there is something to lose', () => {
    const quiet = new Event('beforeunload', { cancelable: true }) as BeforeUnloadEvent;
    warnBeforeUnload(quiet, null);
    expect(quiet.defaultPrevented).toBe(false);
    const warned = new Event('beforeunload', { cancelable: true }) as BeforeUnloadEvent;
    warnBeforeUnload(warned, UNSAVED_CHANGES_WARNING);
    expect(warned.defaultPrevented).toBe(true);
  });
});
