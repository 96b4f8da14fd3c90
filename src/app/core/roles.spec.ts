import { homePathFor, safeReturnUrl } from './roles';

describe('homePathFor', () => {
  it('sends athletes to the portal and staff to the roster', () => {
    expect(homePathFor('athlete')).toBe('/portal');
    expect(homePathFor('coach')).toBe('/athletes');
    expect(homePathFor('owner')).toBe('/athletes');
    expect(homePathFor(null)).toBe('/sign-in');
  });
});

describe('safeReturnUrl', () => {
  it('follows paths inside the app', () => {
    expect(safeReturnUrl('/athletes/4?tab=intake', '/x')).toBe('/athletes/4?tab=intake');
  });

  it('refuses other sites, protocol-relative and backslash tricks', () => {
    expect(safeReturnUrl('https://elsewhere.test/', '/x')).toBe('/x');
    expect(safeReturnUrl('//elsewhere.test', '/x')).toBe('/x');
    expect(safeReturnUrl('/\\elsewhere.test', '/x')).toBe('/x');
    expect(safeReturnUrl('javascript:alert(1)', '/x')).toBe('/x');
  });

  it('does not loop back to sign-in and falls back when missing', () => {
    expect(safeReturnUrl('/sign-in?returnUrl=%2Fteam', '/x')).toBe('/x');
    expect(safeReturnUrl(undefined, '/x')).toBe('/x');
    expect(safeReturnUrl('', '/x')).toBe('/x');
  });
});
