/**
 * What a coach marks on a clip: landmarks per frame and side, gait events, and a scale bar.
 * Shared by client, server and `src/kinematics`. Coordinates are fractions of the working frame's
 * width and height (0–1), origin top-left, exactly as the coach saw the frame; conversion to
 * y-up metres happens only inside `src/kinematics`.
 */
import type { Side } from './assessment';

/** Landmarks in the order the placing tool advances through them. */
export const LANDMARKS = ['shoulder', 'hip', 'knee', 'ankle', 'heel', 'toe'] as const;
export type LandmarkName = (typeof LANDMARKS)[number];

/** On-screen names with the marker site a tape marker goes on (REFERENCES.md camera line). */
export const LANDMARK_LABELS: Record<LandmarkName, string> = {
  shoulder: 'Shoulder',
  hip: 'Hip (greater trochanter)',
  knee: 'Knee (lateral knee)',
  ankle: 'Ankle (lateral malleolus)',
  heel: 'Heel',
  toe: 'Toe (5th metatarsal head)',
};

export const GAIT_EVENT_KINDS = ['initial_contact', 'midstance', 'toe_off'] as const;
export type GaitEventKind = (typeof GAIT_EVENT_KINDS)[number];
export const GAIT_EVENT_LABELS: Record<GaitEventKind, string> = {
  initial_contact: 'Initial contact',
  midstance: 'Midstance',
  toe_off: 'Toe-off',
};

/** A point as a fraction of frame width (x) and height (y), origin top-left. */
export interface FramePoint {
  x: number;
  y: number;
}

/**
 * Where a landmark point came from: `placed` by a person, `followed` by marker following,
 * `proposed` by the app and not yet accepted, `accepted` (a proposal the coach accepted).
 */
export const LANDMARK_ORIGINS = ['placed', 'followed', 'proposed', 'accepted'] as const;
export type LandmarkOrigin = (typeof LANDMARK_ORIGINS)[number];

/** On-screen words for each origin. */
export const LANDMARK_ORIGIN_LABELS: Record<LandmarkOrigin, string> = {
  placed: 'Placed',
  followed: 'Followed',
  proposed: 'Proposed',
  accepted: 'Accepted',
};

/** A landmark point with where it came from. */
export interface LandmarkPoint extends FramePoint {
  /** Left out when saving = `placed` (a person put it there); the server always sends it. */
  origin?: LandmarkOrigin;
  /** 0–1 for automatic points (followed, proposed); absent for placed ones. */
  confidence?: number;
}

/** The landmarks of one side on one frame (any subset). */
export interface FrameLandmarks {
  /** 0-based frame index. */
  frame: number;
  side: Side;
  points: Partial<Record<LandmarkName, LandmarkPoint>>;
}

/**
 * Where a gait event came from: `placed` by a person, `proposed` by the app from landmark positions
 * (not yet confirmed; measures leave it out), or a proposal the coach `accepted`.
 */
export const EVENT_ORIGINS = ['placed', 'proposed', 'accepted'] as const;
export type EventOrigin = (typeof EVENT_ORIGINS)[number];
export const EVENT_ORIGIN_LABELS: Record<EventOrigin, string> = { placed: 'Placed', proposed: 'Proposed', accepted: 'Accepted' };

export interface GaitEventMark {
  frame: number;
  side: Side;
  kind: GaitEventKind;
  /** Where the event came from; absent = `placed`. */
  origin?: EventOrigin;
}

/** Which rule placed a proposed event (see `src/kinematics/event-rules.ts`). */
export type EventProposalRule = 'heel_minimum' | 'knee_extension' | 'coordinate';

/** Body of `POST /api/clips/:id/events/proposals`. */
export interface EventProposalsRequest {
  /** The revision the coach is looking at; a different current revision answers 409. */
  baseRevision: number;
}

/** Answer of `POST /api/clips/:id/events/proposals`: the saved annotations with the new proposals. */
export interface EventProposalsResult {
  annotations: ClipAnnotations;
  /** How many proposed events were added (earlier proposals not yet accepted are replaced). */
  proposed: number;
  /** Per rule, how many of them it placed. */
  byRule: Partial<Record<EventProposalRule, number>>;
  /** Proposals left out, in words (next to an event a person placed or accepted, or out of order with them). */
  skipped: string[];
}

/** Body of `POST /api/clips/:id/follow`: follow the markers of `startFrame` over frames `from`–`to` (inclusive). */
export interface FollowMarkersRequest {
  startFrame: number;
  from: number;
  to: number;
}

/** Answer (202) of `POST /api/clips/:id/follow`: the processed item whose progress the clip's stream carries. */
export interface FollowMarkersStarted {
  itemId: number;
  /** The processed-item kind on the progress stream. */
  kind: 'follow_markers';
}

/**
 * Why marker following got no point for a marker on a frame: `not_found` (the marker was not seen
 * near where it should be: hidden, blurred, out of the picture), `broke_links` (what was found sits
 * too far from the other markers of its thigh, shank or foot to be the marker), `on_other_marker`
 * (it landed on another marker).
 */
export const NOT_FOLLOWED_REASONS = ['not_found', 'broke_links', 'on_other_marker'] as const;
export type NotFollowedReason = (typeof NOT_FOLLOWED_REASONS)[number];

/**
 * A frame where the last follow run over it could not follow one marker: the frame has no point
 * for it from following, so the coach must check it (place the marker by hand, or leave it out).
 * Cleared when a person places or accepts that marker on that frame, and replaced by the next
 * follow run over the frame.
 */
export interface NotFollowedPoint {
  frame: number;
  side: Side;
  landmark: LandmarkName;
  reason: NotFollowedReason;
}

/** A followed point below this confidence is flagged for the coach to check. */
export const FOLLOW_LOW_CONFIDENCE = 0.5;

/** A line over an object of known length in the plane of running. */
export interface ScaleBar {
  frame: number;
  a: FramePoint;
  b: FramePoint;
  lengthM: number;
}

/**
 * Angle gauge: any angle on one frame from three points — an arm end, the vertex, the other arm
 * end (placed in that order with three clicks). Several per frame; `id` is made by the client and
 * kept across saves, so edits merge like landmarks.
 */
export interface AngleGauge {
  /** 1–40 letters, digits, `-` or `_`; unique within the clip. */
  id: string;
  frame: number;
  a: FramePoint;
  vertex: FramePoint;
  b: FramePoint;
}

/** Everything marked on one clip, with a revision for optimistic concurrency. */
export interface ClipAnnotations {
  clipId: number;
  /** Increases by one on every save; a save must name the revision it was based on. */
  revision: number;
  landmarks: FrameLandmarks[];
  events: GaitEventMark[];
  scale: ScaleBar | null;
  /** Angle gauges (the server always sends the list; older copies may lack it = none). */
  gauges?: AngleGauge[];
  /**
   * Frames marker following could not follow a marker on and no person has placed it on since,
   * by frame, side and landmark (read-only: the server keeps it; older copies may lack it = none).
   */
  notFollowed?: NotFollowedPoint[];
  updatedAt: string | null;
  updatedByName: string | null;
}

/** Body of `PUT /api/clips/:id/annotations`. */
export interface ClipAnnotationsWrite {
  /** The revision this edit started from; a different current revision answers 409. */
  baseRevision: number;
  landmarks: FrameLandmarks[];
  events: GaitEventMark[];
  scale: ScaleBar | null;
  /** Angle gauges; left out = none (replaced like everything else). */
  gauges?: AngleGauge[];
}

/** Limits the server enforces (and the client respects). */
export const ANNOTATION_LIMITS = {
  landmarkFrames: 20_000,
  events: 2_000,
  scaleLengthM: { min: 0.05, max: 10 },
  gauges: 1_000,
} as const;

/**
 * The shortest line worth calling a scale bar, in working-frame pixels: the scale tool drops a
 * shorter drag and the API refuses a shorter bar (a pixel or two of error in either end would
 * already be several percent of every length measured).
 */
export const MIN_SCALE_LINE_PX = 20;
