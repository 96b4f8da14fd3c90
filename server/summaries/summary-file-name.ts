/**
 * The visit summary's download name, from athlete, visit and date ("Ada Kestrel – Re-test
 * comparison – 2026-11-24.pdf"), and a minimal Content-Disposition header that carries it: an
 * ASCII `filename` fallback for old clients and the exact name as UTF-8 in `filename*` (RFC 6266,
 * RFC 8187). Pure.
 */
import { contentDisposition as fileContentDisposition } from '../http/file-names';

/** The summary's file name in full (any script), and its plain-ASCII fallback. */
export interface SummaryFileName {
  utf8: string;
  ascii: string;
}

/**
 * "Ada Kestrel – Baseline visit summary – 2026-10-06.pdf" and its fallback
 * "ada-kestrel-baseline-visit-summary-2026-10-06.pdf"; `what` names the document and visit.
 */
export function summaryFileName(p: { athleteName: string; what: string; date: string }): SummaryFileName {
  const { what } = p;
  // Characters no file system accepts, and control characters, become spaces.
  const clean = (s: string) =>
    s
      .replace(/[\\/:*?"<>|\p{Cc}]+/gu, ' ')
      .replace(/\s+/g, ' ')
      .trim();
  const utf8 = `${[clean(p.athleteName), clean(what), p.date].filter(Boolean).join(' – ')}.pdf`;
  const ascii =
    [p.athleteName, what, p.date]
      .join(' ')
      .normalize('NFKD')
      .replace(/[\u0300-\u036f]/g, '')
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, '-')
      .replace(/^-+|-+$/g, '') || 'visit-summary';
  return { utf8, ascii: `${ascii}.pdf` };
}

/** `attachment; filename="…ascii…"; filename*=UTF-8''…` (or `inline; …`). */
export function contentDisposition(type: 'inline' | 'attachment', name: SummaryFileName): string {
  return fileContentDisposition(name.utf8, type, name.ascii);
}
