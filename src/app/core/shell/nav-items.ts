import type { Role } from '../../../contracts/api';

/** One entry of the side navigation. */
export interface NavItem {
  label: string;
  icon: string;
  path: string;
  /** Match the path exactly for the active highlight (for `/portal` vs `/portal/profile`). */
  exact: boolean;
}

/** What a role may open, in order. */
export function navItemsFor(role: Role | null): NavItem[] {
  switch (role) {
    case 'owner':
      return [
        { label: 'Athletes', icon: 'groups', path: '/athletes', exact: false },
        { label: 'Exercise library', icon: 'fitness_center', path: '/exercises', exact: false },
        { label: 'Billing', icon: 'receipt_long', path: '/billing', exact: false },
        { label: 'Team', icon: 'badge', path: '/team', exact: false },
        { label: 'Reference bands', icon: 'tune', path: '/settings/reference-bands', exact: false },
        { label: 'Clinic details', icon: 'storefront', path: '/settings/clinic', exact: false },
      ];
    case 'coach':
      return [
        { label: 'Athletes', icon: 'groups', path: '/athletes', exact: false },
        { label: 'Exercise library', icon: 'fitness_center', path: '/exercises', exact: false },
      ];
    case 'athlete':
      return [
        { label: 'Home', icon: 'home', path: '/portal', exact: true },
        { label: 'My plan', icon: 'view_timeline', path: '/portal/plan', exact: false },
        { label: 'My invoices', icon: 'receipt_long', path: '/portal/invoices', exact: false },
        { label: 'My profile', icon: 'person', path: '/portal/profile', exact: false },
        { label: 'Account', icon: 'manage_accounts', path: '/account', exact: false },
      ];
    default:
      return [];
  }
}
