/**
 * The one place the review workspace calls `src/kinematics` (measures, bands, event checks and the
 * overlay), so the client and the server use one implementation of the math and the drawing.
 */
export {
  DEFAULT_REFERENCE_BANDS,
  KINEMATICS_VERSION,
  classifyFootStrike,
  computeClipMeasures,
  drawOverlay,
  OVERLAY_COLOURS,
  OVERLAY_SEGMENTS,
  validateEvents,
} from '../../../kinematics';
export type { Canvas2DLike, ClipMeasureInput, OverlayOptions } from '../../../kinematics';
