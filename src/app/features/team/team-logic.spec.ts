import type { StaffMember } from '../../../contracts/api';
import { heirChoices, staffStatus } from './team-logic';

const member = (id: number, name: string, over: Partial<StaffMember> = {}): StaffMember => ({
  id,
  name,
  email: `${id}@clinic.test`,
  role: 'coach',
  active: true,
  deactivatedAt: null,
  athleteCount: 0,
  createdAt: '2026-01-01T00:00:00Z',
  ...over,
});

describe('heirChoices', () => {
  const staff = [
    member(1, 'Mira Owner', { role: 'owner' }),
    member(2, 'Tobin'),
    member(3, 'Ilse'),
    member(4, 'Gone Coach', { active: false, deactivatedAt: '2026-11-01T10:00:00Z' }),
  ];

  it('offers the owner first as "You", then the other active staff by name', () => {
    expect(heirChoices(staff, 2, 1)).toEqual([
      { id: 1, label: 'You (Mira Owner)' },
      { id: 3, label: 'Ilse' },
    ]);
  });

  it('never offers the coach who leaves or a deactivated one', () => {
    const ids = heirChoices(staff, 3, 1).map((c) => c.id);
    expect(ids).not.toContain(3);
    expect(ids).not.toContain(4);
  });
});

describe('staffStatus', () => {
  it('says Active, or when the member was deactivated', () => {
    expect(staffStatus(member(2, 'Tobin'), () => 'x')).toEqual({ label: 'Active', since: null });
    expect(staffStatus(member(4, 'Gone', { active: false, deactivatedAt: '2026-11-01T10:00:00Z' }), (iso) => iso.slice(0, 10))).toEqual({
      label: 'Deactivated',
      since: 'since 2026-11-01',
    });
  });
});
