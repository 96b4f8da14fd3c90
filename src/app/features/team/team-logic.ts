import type { StaffMember } from '../../../contracts/api';

/** One choice of "who takes over the athletes". */
export interface HeirChoice {
  id: number;
  label: string;
}

/**
 * Who may take over a departing coach's athletes: the signed-in owner first (as "You"), then the
 * other active staff by name; never the one leaving, never a deactivated coach.
 */
export function heirChoices(staff: StaffMember[], leavingId: number, selfId: number): HeirChoice[] {
  const eligible = staff.filter((s) => s.active && s.id !== leavingId);
  const self = eligible.find((s) => s.id === selfId);
  const others = eligible.filter((s) => s.id !== selfId).sort((a, b) => a.name.localeCompare(b.name));
  return [...(self ? [{ id: self.id, label: `You (${self.name})` }] : []), ...others.map((s) => ({ id: s.id, label: s.name }))];
}

/** What the Team list says about a member's state: "Active", or "Deactivated" since a date. */
export function staffStatus(member: StaffMember, formatDate: (iso: string) => string): { label: string; since: string | null } {
  if (member.active) return { label: 'Active', since: null };
  return { label: 'Deactivated', since: member.deactivatedAt ? `since ${formatDate(member.deactivatedAt)}` : null };
}
