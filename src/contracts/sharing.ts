/**
 * Shapes of what a coach shares with an athlete: annotated stills and visit summaries (PDF).
 * Types and limits only; the server renders, the client requests and shows.
 */

/** Longest caption of a still, characters. */
export const CAPTION_MAX = 280;
/** Longest findings / plan text of a visit summary, characters each. */
export const SUMMARY_TEXT_MAX = 4000;
/** Most stills one visit summary carries. */
export const SUMMARY_STILLS_MAX = 8;

/** Rendering state of a still or summary (rendered by a background job). */
export type RenderStatus = 'rendering' | 'ready' | 'failed';

/** One panel of a still: a clip's frame with the overlay as it was when the still was saved. */
export interface StillPanel {
  clipId: number;
  assessmentId: number;
  frameIndex: number;
  /** Time of the frame in the clip, seconds. */
  timeS: number;
  /** Assessment label for the panel heading, e.g. "Baseline · 6 Oct 2026". */
  label: string;
}

/** A degree label drawn on a still. */
export interface StillLabel {
  /** Index into {@link Still.panels}. */
  panel: number;
  side: 'left' | 'right';
  joint: 'hip' | 'knee' | 'ankle';
  /** Exactly the text drawn, e.g. "11.2° ext". */
  text: string;
}

/** A rectangle in the rendered PNG, px. */
export interface StillRect {
  x: number;
  y: number;
  width: number;
  height: number;
}

/** An annotated still: one frame, or a side-by-side pair (Re-test comparison). */
export interface Still {
  id: number;
  athleteId: number;
  /** The assessment the still belongs to (the first panel's; for a pair, the Re-test's). */
  assessmentId: number;
  kind: 'frame' | 'pair';
  panels: StillPanel[];
  caption: string;
  /** Whether angle arcs and degree labels are drawn. */
  showAngles: boolean;
  status: RenderStatus;
  /** 0–1 while rendering. */
  progress: number;
  error: string | null;
  /** Rendered PNG size, px (null until ready). */
  width: number | null;
  height: number | null;
  /** Degree labels drawn on the still, per panel, so the text can be checked against measures. */
  labels: StillLabel[];
  /** Where each panel's frame sits in the PNG, px (null until ready). */
  layout: StillRect[] | null;
  publishedAt: string | null;
  publishedBy: string | null;
  createdAt: string;
  createdBy: string;
  /** Authorised image URLs: full PNG, and a smaller JPEG for phones. */
  imageUrl: string;
  phoneImageUrl: string;
}

/** Body of `POST /api/clips/:clipId/stills`. */
export interface StillCreate {
  frameIndex: number;
  caption: string;
  showAngles: boolean;
  /** Second panel for a side-by-side still (drawn left of this clip's panel: baseline first). */
  pairWith?: { clipId: number; frameIndex: number } | null;
}

/** Body of `PATCH /api/stills/:id`. */
export interface StillUpdate {
  caption: string;
}

/** A visit summary PDF of an assessment, or of a Re-test comparison against a baseline. */
export interface VisitSummary {
  id: number;
  athleteId: number;
  assessmentId: number;
  /** Set when the summary compares the assessment with this earlier one. */
  baselineAssessmentId: number | null;
  title: string;
  findings: string;
  planText: string;
  stillIds: number[];
  status: RenderStatus;
  progress: number;
  error: string | null;
  /** Pages in the rendered PDF (null until ready). */
  pageCount: number | null;
  publishedAt: string | null;
  publishedBy: string | null;
  createdAt: string;
  createdBy: string;
  /** Authorised PDF URL (inline); add `?download=1` for an attachment. */
  pdfUrl: string;
}

/** Body of `POST /api/assessments/:assessmentId/summaries`. */
export interface VisitSummaryCreate {
  baselineAssessmentId?: number | null;
  findings: string;
  planText: string;
  stillIds: number[];
}

/** What the athlete's portal home shows: only published items of the signed-in athlete. */
export interface PortalShared {
  stills: Still[];
  summaries: VisitSummary[];
}

/**
 * The one small caution line drawn at the foot of every saved still (`server/render/still-render.ts`),
 * so the picture carries it wherever it is shown or forwarded.
 */
export const STILL_CAUTION_LINE = "Figures support, and do not replace, a licensed clinician's judgement.";
