/**
 * Athlete data: export, erasure, consent withdrawal and clip retention (API shapes; types and
 * constants only).
 */

/** How long a finished export can be downloaded, hours. */
export const EXPORT_LINK_HOURS = 24;

/** An export's state: being built (progress on the athlete's stream), ready to download, failed, or past its link's life. */
export type DataExportStatus = 'building' | 'ready' | 'failed' | 'expired';

/** One export of everything held about an athlete (a zip). */
export interface DataExport {
  id: number;
  athleteId: number;
  status: DataExportStatus;
  /** 0–1 while building. */
  progress: number;
  error: string | null;
  sizeBytes: number | null;
  /** Files in the zip (data.json and README.txt included). */
  fileCount: number | null;
  createdAt: string;
  readyAt: string | null;
  /** When the download link stops working. */
  expiresAt: string | null;
  /** `/api/data-exports/:id/download` while ready, else null. */
  downloadUrl: string | null;
}

/** What the owner's Data section of an athlete shows. */
export interface AthleteDataOverview {
  athleteId: number;
  /** The full name to type to confirm erasure. */
  fullName: string;
  /** Latest consents (null: never recorded). */
  videoConsent: boolean | null;
  shareConsent: boolean | null;
  /** When consent to video was withdrawn while clips remain (the owner is asked whether to erase them), else null. */
  videoWithdrawnAt: string | null;
  clipCount: number;
  /** Bytes of the original clips. */
  clipBytes: number;
  /** Invoices kept after an erasure (issued, paid, refunded or cancelled). */
  keptInvoiceCount: number;
}

/** POST `/api/athletes/:id/erasure`: the athlete's full name, typed. */
export interface ErasureRequest {
  confirmName: string;
}

/** What an erasure leaves: the reference kept invoices now carry. */
export interface ErasureResult {
  reference: string;
  /** Invoices kept (with the reference instead of the name). */
  keptInvoices: number;
}

/** POST `/api/athletes/:id/clips/erasure`: erase the clips only. */
export interface ClipErasureResult {
  removedClips: number;
}

/** One clip the retention check would remove. */
export interface RetentionItem {
  clipId: number;
  athleteId: number;
  athleteName: string;
  assessmentDate: string;
  originalName: string;
  sizeBytes: number;
  /** The athlete's last activity (a visit, a clip, a logged session, a profile change). */
  lastActivity: string;
}

/** The latest list of the retention check; its clips are removed only when the owner confirms it. */
export interface RetentionReview {
  id: number;
  listedAt: string;
  /** Clips still eligible (an athlete active since drops out). */
  items: RetentionItem[];
  totalBytes: number;
  confirmedAt: string | null;
  removedCount: number | null;
}

/** GET `/api/clinic/retention`. */
export interface RetentionSettings {
  /** Months without activity after which clips are proposed for removal; null: off (the default). */
  months: number | null;
  review: RetentionReview | null;
}

/** PUT `/api/clinic/retention`. */
export interface RetentionWrite {
  months: number | null;
}

/** Longest retention period that can be set, months. */
export const RETENTION_MAX_MONTHS = 120;
