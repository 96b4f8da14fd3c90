import type PDFDocument from 'pdfkit';
import type { LogoImage } from '../clinic/clinic-brand';

/** Largest box a logo takes in a PDF header (points). */
export const PDF_LOGO_BOX = { width: 140, height: 48 } as const;

/**
 * Draws the clinic's logo at the top-right corner of the page's text area, fitted into
 * {@link PDF_LOGO_BOX} (its transparency kept: pdfkit embeds the PNG's alpha as a soft mask).
 * Answers the width it takes, so the header text can leave room.
 */
export function drawLogoTopRight(doc: PDFKit.PDFDocument, logo: LogoImage | null, top: number): number {
  if (!logo || logo.width <= 0 || logo.height <= 0) return 0;
  const scale = Math.min(PDF_LOGO_BOX.width / logo.width, PDF_LOGO_BOX.height / logo.height);
  const w = logo.width * scale;
  const h = logo.height * scale;
  const right = doc.page.width - doc.page.margins.right;
  const { x, y } = doc;
  doc.image(logo.png, right - w, top, { width: w, height: h });
  doc.x = x;
  doc.y = y;
  return w + 12;
}

export type { PDFDocument };
