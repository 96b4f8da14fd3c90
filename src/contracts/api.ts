/**
 * Shapes of the JSON the API sends and receives. Shared by the client (typed HttpClient calls)
 * and the server (responses are built to these types). Types only, plus no runtime code.
 */
import type { BodyRegion, BodySide, DistanceUnit, InjuryStatus, Surface } from './intake';

export type Role = 'owner' | 'coach' | 'athlete';

/** Error body of every non-2xx answer. */
export interface ApiErrorBody {
  error: { code: string; message: string; details?: unknown };
}

/** The signed-in user. */
export interface SessionUser {
  id: number;
  email: string;
  name: string;
  role: Role;
  clinicId: number;
  clinicName: string;
  /** The athlete record of an athlete user; null for staff. */
  athleteId: number | null;
}

export interface AppConfig {
  /** Whether the demo helpers (fake mail, mailbox page, demo sign-ins) are on. */
  demoMode: boolean;
  version: string;
}

export interface StaffMember {
  id: number;
  email: string;
  name: string;
  role: Role;
  active: boolean;
  createdAt: string;
}

export interface PendingInvitation {
  id: number;
  email: string;
  name: string;
  role: Role;
  athleteId: number | null;
  expiresAt: string;
  createdAt: string;
}

export interface StaffList {
  staff: StaffMember[];
  invitations: PendingInvitation[];
}

/** What the invitation link page shows before the invitee sets a password. */
export interface InvitationPreview {
  email: string;
  name: string;
  role: Role;
  clinicName: string;
}

export interface ConsentState {
  granted: boolean;
  recordedAt: string;
  recordedByName: string;
}

export interface InjuryEntry {
  id?: number;
  region: BodyRegion;
  side: BodySide;
  /** Month the injury began, `YYYY-MM`. */
  when: string;
  status: InjuryStatus;
  notes: string;
}

export interface PainEntry {
  region: BodyRegion;
  /** 0–10 numeric rating. */
  score: number;
}

/** One row of the roster. */
export interface AthleteSummary {
  id: number;
  firstName: string;
  lastName: string;
  email: string | null;
  dateOfBirth: string | null;
  goalEvent: string | null;
  goalDate: string | null;
  coachId: number | null;
  coachName: string | null;
  /** Whether the athlete has signed in at least once (accepted an invitation). */
  hasAccount: boolean;
  /** Whether an unexpired, unused invitation exists. */
  invitationPending: boolean;
  /** Whether consent to video recording is currently granted. */
  videoConsent: boolean;
  /** Highest current pain score, or null when none recorded. */
  maxPain: number | null;
  createdAt: string;
  updatedAt: string;
}

export interface AthleteIntake {
  dateOfBirth: string | null;
  heightCm: number | null;
  distanceUnit: DistanceUnit;
  /** In `distanceUnit`. */
  weeklyDistance: number | null;
  /** In `distanceUnit`. */
  longestRecentRun: number | null;
  goalEvent: string | null;
  goalDate: string | null;
  surfaces: Surface[];
  injuries: InjuryEntry[];
  pain: PainEntry[];
  consents: { videoRecording: boolean; shareStills: boolean };
}

export interface AthleteDetail extends AthleteSummary {
  heightCm: number | null;
  distanceUnit: DistanceUnit;
  weeklyDistance: number | null;
  longestRecentRun: number | null;
  surfaces: Surface[];
  injuries: InjuryEntry[];
  pain: PainEntry[];
  consents: { videoRecording: ConsentState | null; shareStills: ConsentState | null };
  /** Coach-only free text; omitted for athletes. */
  notes?: string | null;
}

export interface AthleteCreate {
  firstName: string;
  lastName: string;
  email?: string | null;
  dateOfBirth?: string | null;
  coachId?: number | null;
  notes?: string | null;
}

export type AthleteUpdate = Partial<AthleteCreate>;

export interface MailboxMessageSummary {
  id: number;
  to: string;
  from: string;
  subject: string;
  receivedAt: string;
}

export interface MailboxMessage extends MailboxMessageSummary {
  text: string;
  html: string | null;
}
