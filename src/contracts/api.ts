/**
 * Shapes of the JSON the API sends and receives. Shared by the client (typed HttpClient calls)
 * and the server (responses are built to these types). Types only, plus no runtime code.
 */
import type { AssessmentKind, ClipStatus, Direction, FilmSurface, Side, SpeedUnit } from './assessment';
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
  /** Whether the demo helpers (fake mail, demo inbox, demo sign-ins) are on. */
  demoMode: boolean;
  version: string;
  /** Largest clip the server accepts, bytes. */
  uploadMaxBytes: number;
  /**
   * Demo mode: the developer inbox where e-mail lands (127.0.0.1 of the machine running the demo,
   * outside the app's sign-in); null otherwise.
   */
  demoInboxUrl: string | null;
}

export interface StaffMember {
  id: number;
  email: string;
  name: string;
  role: Role;
  /** False once the owner deactivated them: no sign-in, no athletes. */
  active: boolean;
  /** When they were deactivated; null while active. */
  deactivatedAt: string | null;
  /** Athletes they coach now. */
  athleteCount: number;
  createdAt: string;
}

/** `POST /api/staff/:id/deactivate`: who takes the coach's athletes (default: the owner). */
export interface StaffDeactivate {
  reassignTo?: number;
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

// ─── Assessments and clips ────────────────────────────────────────────────────────────────

export interface Assessment {
  id: number;
  athleteId: number;
  /** Visit date `YYYY-MM-DD`. */
  date: string;
  kind: AssessmentKind;
  surface: FilmSurface;
  /** Treadmill belt speed (or overground target speed) in m/s; null when not recorded. */
  speedMps: number | null;
  /** Unit the coach typed the speed in, for display. */
  speedUnit: SpeedUnit;
  /** Treadmill incline, percent grade. */
  inclinePercent: number | null;
  shoes: string | null;
  cameraNotes: string | null;
  notes: string | null;
  clipCount: number;
  createdAt: string;
  updatedAt: string;
}

export interface AssessmentWrite {
  date: string;
  kind: AssessmentKind;
  surface: FilmSurface;
  /** Speed as typed: km/h, mph, or pace in seconds per km / per mile. Null when not recorded. */
  speed: { value: number; unit: SpeedUnit } | null;
  inclinePercent: number | null;
  shoes: string | null;
  cameraNotes: string | null;
  notes: string | null;
}

export interface Clip {
  id: number;
  assessmentId: number;
  athleteId: number;
  originalName: string;
  sizeBytes: number;
  status: ClipStatus;
  /** Frames written so far while extracting. */
  progress: { done: number; total: number } | null;
  /** Why processing failed, in words for the user. */
  error: string | null;
  nearSide: Side;
  direction: Direction;
  /** Capture rate for slow-motion files whose container rate differs; null = use `fps`. */
  captureFps: number | null;
  /** Container frame rate as probed. */
  fps: number | null;
  /** `captureFps ?? fps`: the rate all timing uses. */
  effectiveFps: number | null;
  /** Working frame size (after rotation and scaling). */
  width: number | null;
  height: number | null;
  frameCount: number | null;
  durationS: number | null;
  rotation: number | null;
  codec: string | null;
  thumbCount: number;
  /** One thumbnail every this many frames. */
  thumbEvery: number | null;
  uploadedByName: string;
  /** Who uploaded it (athletes may delete only their own uploads). */
  uploadedById: number | null;
  /** Whether landmarks or gait events exist: then only staff may change the clip's settings. */
  marked: boolean;
  createdAt: string;
}

export type ClipUpdate = Partial<Pick<Clip, 'nearSide' | 'direction' | 'captureFps'>>;

export interface AssessmentDetail extends Assessment {
  clips: Clip[];
  /** Whether the athlete's video consent is in force (uploads need it). */
  videoConsent: boolean;
}

/** A clip's frame manifest (`GET /api/clips/:id/manifest`), written by the server's frame extraction. */
export interface FrameManifest {
  version: 1;
  /**
   * Whether every frame is extracted. While extraction runs the manifest is the plan (`false`):
   * `frameCount` is the probe's count, timestamps are computed, and frames arrive in order (the
   * clip's `progress.done` says how many are ready). Manifests written before this field existed
   * are complete.
   */
  complete?: boolean;
  /** Number of files in `frames/` (one per decoded frame); the probe's count while not complete. */
  frameCount: number;
  /** Working frame size in pixels, after rotation and scaling (even numbers). */
  width: number;
  height: number;
  /** Frames per second as probed (`avg_frame_rate`). */
  fps: number;
  /** Clip duration in seconds as probed. */
  durationS: number;
  /** Clockwise degrees ffmpeg turned the stored frames to display them (0/90/180/270). */
  rotationApplied: 0 | 90 | 180 | 270;
  /** Presentation time of each frame in ms, first frame at 0 (index i ↔ `frames/` file i + 1). */
  timestampsMs: number[];
  /** `decoded`: read from ffmpeg's per-frame log; `computed`: i × 1000 / fps (constant rate assumed). */
  timestampsSource: 'decoded' | 'computed';
  /** One thumbnail every this many frames. */
  thumbEvery: number;
  thumbCount: number;
  thumbWidth: number;
  thumbHeight: number;
  /** ffmpeg `-q:v` of the frame JPEGs (2 best … 31 worst). */
  quality: number;
}

// ─── Annotations and measures ─────────────────────────────────────────────────────────────

export type { ClipAnnotations, ClipAnnotationsWrite, FrameLandmarks, FramePoint, GaitEventMark, ScaleBar } from './annotations';
