import { navItemsFor } from './nav-items';

const labels = (...args: Parameters<typeof navItemsFor>) => navItemsFor(...args).map((i) => i.label);

describe('navItemsFor', () => {
  it('gives owners the roster, exercise library, billing, team and reference bands, and the mailbox only in demo mode', () => {
    expect(labels('owner', false)).toEqual(['Athletes', 'Exercise library', 'Billing', 'Team', 'Reference bands', 'Clinic details']);
    expect(labels('owner', true)).toEqual(['Athletes', 'Exercise library', 'Billing', 'Team', 'Reference bands', 'Clinic details', 'Mailbox']);
  });

  it('gives coaches the roster and the exercise library, even in demo mode', () => {
    expect(labels('coach', true)).toEqual(['Athletes', 'Exercise library']);
  });

  it('gives athletes their own pages', () => {
    expect(navItemsFor('athlete', true).map((i) => i.path)).toEqual(['/portal', '/portal/plan', '/portal/invoices', '/portal/profile']);
    expect(navItemsFor('athlete', true).map((i) => i.label)).toEqual(['Home', 'My plan', 'My invoices', 'My profile']);
  });

  it('gives signed-out visitors nothing', () => {
    expect(navItemsFor(null, true)).toEqual([]);
  });
});
