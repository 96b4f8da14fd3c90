import type { AnnotatedClip } from '../../../contracts/annotated-clips';
import type { Still, VisitSummary } from '../../../contracts/sharing';

/** A still as the server answers, for specs. */
export function aStill(over: Partial<Still> = {}): Still {
  return {
    id: 1,
    athleteId: 9,
    assessmentId: 20,
    kind: 'frame',
    panels: [{ clipId: 7, assessmentId: 20, frameIndex: 41, timeS: 0.68, label: 'Re-test · 1 Dec 2026' }],
    caption: '',
    showAngles: true,
    status: 'ready',
    progress: 1,
    error: null,
    width: 1280,
    height: 720,
    labels: [],
    layout: null,
    publishedAt: null,
    publishedBy: null,
    createdAt: '2026-12-01T10:00:00Z',
    createdBy: 'Tobin Ashgrove',
    imageUrl: `/api/stills/${over.id ?? 1}/image.png`,
    phoneImageUrl: `/api/stills/${over.id ?? 1}/image.jpg`,
    ...over,
  };
}

/** A visit summary as the server answers, for specs. */
export function aSummary(over: Partial<VisitSummary> = {}): VisitSummary {
  return {
    id: 5,
    athleteId: 9,
    assessmentId: 20,
    baselineAssessmentId: 10,
    title: 'Re-test comparison · 1 Dec 2026',
    findings: 'Hip extension improved.',
    planText: 'Keep the drills.',
    stillIds: [1],
    status: 'ready',
    progress: 1,
    error: null,
    pageCount: 2,
    publishedAt: null,
    publishedBy: null,
    createdAt: '2026-12-01T10:05:00Z',
    createdBy: 'Tobin Ashgrove',
    pdfUrl: '/api/summaries/5/pdf',
    ...over,
  };
}

/** An annotated clip as the server answers, for specs. */
export function anAnnotatedClip(over: Partial<AnnotatedClip> = {}): AnnotatedClip {
  return {
    id: 3,
    athleteId: 9,
    assessmentId: 20,
    kind: 'single',
    panels: [{ clipId: 7, assessmentId: 20, label: 'Re-test · 1 Dec 2026', fromFrame: 10, toFrame: 69 }],
    factor: 0.25,
    caption: '',
    showAngles: true,
    status: 'ready',
    progress: 1,
    error: null,
    width: 640,
    height: 360,
    frameCount: 120,
    fps: 30,
    durationS: 4,
    repeat: 2,
    note: null,
    publishedAt: null,
    publishedBy: null,
    createdAt: '2026-12-01T10:00:00Z',
    createdBy: 'Tobin Ashgrove',
    videoUrl: `/api/annotated-clips/${over.id ?? 3}/video.mp4?v=1`,
    ...over,
  };
}
