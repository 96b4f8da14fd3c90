import { navItemsFor } from './nav-items';

const labels = (...args: Parameters<typeof navItemsFor>) => navItemsFor(...args).map((i) => i.label);

describe('navItemsFor', () => {
  it('gives owners the roster, exercise library, billing, team and reference bands, clinic details (no in-app mailbox)', () => {
    expect(labels('owner')).toEqual(['Athletes', 'Exercise library', 'Billing', 'Team', 'Reference bands', 'Clinic details']);
  });

  it('gives coaches the roster and the exercise library', () => {
    expect(labels('coach')).toEqual(['Athletes', 'Exercise library']);
  });

  it('gives athletes their own pages', () => {
    expect(navItemsFor('athlete').map((i) => i.path)).toEqual([
      '/portal',
      '/portal/plan',
      '/portal/invoices',
      '/portal/profile',
      '/account',
    ]);
    expect(navItemsFor('athlete').map((i) => i.label)).toEqual(['Home', 'My plan', 'My invoices', 'My profile', 'Account']);
  });

  it('gives signed-out visitors nothing', () => {
    expect(navItemsFor(null)).toEqual([]);
  });
});
