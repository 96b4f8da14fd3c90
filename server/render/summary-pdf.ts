import PDFDocument from 'pdfkit';
import type { ComparisonRow, Measure } from '../../src/contracts/measures';
import { verdictText } from '../../src/kinematics/comparison';
import { bandRange, decimalsFor, formatMeasure, formatValue } from '../../src/kinematics/format';
import { registerPdfFonts } from './fonts';

/** One visit's facts for the header table. */
export interface SummaryVisit {
  /** "Baseline · 6 Oct 2026". */
  label: string;
  surface: string;
  /** "3.06 m/s (11.0 km/h)" or "Not recorded". */
  speed: string;
  incline: string | null;
  shoes: string | null;
}

/** A still to place in the PDF. */
export interface SummaryStill {
  /** PNG bytes or path. */
  image: Buffer | string;
  width: number;
  height: number;
  caption: string;
}

/** Everything the visit summary shows; assembled by the summaries service. */
export interface SummaryDocument {
  clinicName: string;
  athleteName: string;
  title: string;
  /** Date the PDF was made, shown in the header ("1 Dec 2026"). */
  issuedOn: string;
  coachName: string;
  /** The assessment (a single visit), or [baseline, re-test] for a comparison. */
  visits: SummaryVisit[];
  /** Per clip of a single visit: its measures (empty list = not measured). */
  measures: { heading: string; measures: Measure[] }[];
  /** Rows of a comparison (only for two visits). */
  comparison: ComparisonRow[] | null;
  stills: SummaryStill[];
  findings: string;
  planText: string;
  caution: string;
}

/** Plain-language caution printed on every summary (DESIGN.md "Safety and privacy"). */
export const SUMMARY_CAUTION =
  'These figures and notes support, and do not replace, the judgement of your licensed clinician. ' +
  'Stop any exercise that causes sharp or worsening pain and contact your clinician. ' +
  'Follow the regulations that apply where you are treated.';

const MARGIN = 50;
const INK = '#1B2A26';
const MUTED = '#55645F';
const SPRUCE = '#1F5C4A';
const RULE = '#C9D4D0';
const SHADE = '#EEF3F1';


const POSITION_TEXT = { below: 'Below', within: 'Within', above: 'Above' } as const;

/** The shipped face is the Latin subset: write the few maths signs we use in words. */
export function pdfSafe(text: string): string {
  return text.replace(/≥\s?/g, 'at least ').replace(/≤\s?/g, 'at most ').replace(/→/g, 'to');
}

/** "+7.0°", "−2.7°", "0.0°" (a change that rounds to zero has no sign). */
export function signedChange(change: number, unit: string): string {
  const shown = Number(change.toFixed(decimalsFor(unit)));
  if (shown === 0) return formatValue(0, unit);
  return `${shown > 0 ? '+' : '−'}${formatValue(Math.abs(shown), unit)}`;
}

const sideWord = (side: 'left' | 'right' | null) => (side === 'left' ? 'left' : side === 'right' ? 'right' : '');

/** Renders the visit summary PDF (A4, pdfkit, shipped Source Sans 3). */
export async function renderSummaryPdf(doc0: SummaryDocument, onProgress?: (f: number) => void | Promise<void>): Promise<{ pdf: Buffer; pageCount: number }> {
  const doc = new PDFDocument({
    size: 'A4',
    margins: { top: MARGIN, bottom: MARGIN + 20, left: MARGIN, right: MARGIN },
    bufferPages: true,
    info: { Title: `${doc0.title} - ${doc0.athleteName}`, Author: doc0.clinicName, Creator: 'Trailframe' },
  });
  registerPdfFonts(doc);
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const ended = new Promise<void>((resolve, reject) => {
    doc.on('end', () => resolve());
    doc.on('error', reject);
  });

  const width = doc.page.width - 2 * MARGIN;
  const bottom = () => doc.page.height - doc.page.margins.bottom;
  const ensure = (h: number) => {
    if (doc.y + h > bottom()) doc.addPage();
  };
  const heading = (text: string) => {
    ensure(60);
    doc.moveDown(0.8);
    doc.font('semibold').fontSize(13).fillColor(SPRUCE).text(text, MARGIN, doc.y, { width });
    doc.moveTo(MARGIN, doc.y + 2).lineTo(MARGIN + width, doc.y + 2).lineWidth(0.6).strokeColor(RULE).stroke();
    doc.moveDown(0.5);
  };
  const paragraph = (text: string, empty: string) => {
    doc.font(text.trim() ? 'regular' : 'italic').fontSize(10.5).fillColor(text.trim() ? INK : MUTED);
    doc.text(text.trim() || empty, MARGIN, doc.y, { width, lineGap: 2 });
  };

  /** A table with fixed column widths; wraps cells and breaks pages between rows. */
  const table = (cols: { title: string; width: number }[], rows: string[][]) => {
    const pad = 4;
    const drawRow = (cells: string[], head: boolean) => {
      const fontOf = (i: number) => (head || i === 0 ? 'semibold' : 'regular');
      doc.fontSize(head ? 9 : 9.5);
      const h = Math.max(...cells.map((c, i) => doc.font(fontOf(i)).heightOfString(c, { width: cols[i]!.width - 2 * pad }))) + 2 * pad;
      if (doc.y + h > bottom()) {
        doc.addPage();
        if (!head) drawRow(cols.map((c) => c.title), true);
      }
      const y = doc.y;
      if (head) doc.rect(MARGIN, y, width, h).fill(SHADE);
      let x = MARGIN;
      cells.forEach((c, i) => {
        doc.fillColor(head ? SPRUCE : INK).font(fontOf(i));
        doc.text(c, x + pad, y + pad, { width: cols[i]!.width - 2 * pad });
        x += cols[i]!.width;
      });
      doc.moveTo(MARGIN, y + h).lineTo(MARGIN + width, y + h).lineWidth(0.4).strokeColor(RULE).stroke();
      doc.x = MARGIN;
      doc.y = y + h;
    };
    drawRow(cols.map((c) => c.title), true);
    for (const r of rows) drawRow(r, false);
  };

  // ── Header ──
  doc.font('semibold').fontSize(10).fillColor(MUTED).text(doc0.clinicName, MARGIN, MARGIN, { width, continued: false });
  doc.font('bold').fontSize(22).fillColor(INK).text(doc0.title, { width });
  doc.font('regular').fontSize(12).fillColor(INK).text(`Athlete: ${doc0.athleteName}`, { width });
  doc.font('regular').fontSize(10).fillColor(MUTED).text(`Prepared by ${doc0.coachName} on ${doc0.issuedOn}`, { width });

  // ── Caution ──
  doc.moveDown(0.8);
  const cautionTop = doc.y;
  doc.font('semibold').fontSize(9.5);
  const cautionH = doc.heightOfString(doc0.caution, { width: width - 20 }) + 16;
  doc.rect(MARGIN, cautionTop, width, cautionH).fill('#FFF6E5');
  doc.fillColor('#6B4A00').text(doc0.caution, MARGIN + 10, cautionTop + 8, { width: width - 20 });
  doc.y = cautionTop + cautionH;

  // ── Visit facts ──
  heading(doc0.visits.length > 1 ? 'Visits compared' : 'Visit');
  const factCols = [{ title: '', width: 110 }, ...doc0.visits.map((v) => ({ title: v.label, width: (width - 110) / doc0.visits.length }))];
  table(factCols, [
    ['Surface', ...doc0.visits.map((v) => v.surface)],
    ['Speed', ...doc0.visits.map((v) => v.speed)],
    ['Incline', ...doc0.visits.map((v) => v.incline ?? 'Not recorded')],
    ['Shoes', ...doc0.visits.map((v) => v.shoes ?? 'Not recorded')],
  ]);
  await onProgress?.(0.15);

  // ── Findings ──
  heading('Findings');
  paragraph(doc0.findings, 'No findings written.');

  // ── Measures ──
  const sources = new Map<string, string>();
  heading(doc0.comparison ? 'Measures: Baseline and Re-test' : 'Measures');
  if (doc0.comparison) {
    const rows = doc0.comparison.filter((r) => r.verdict !== 'not_measured' || r.baseline !== null || r.retest !== null);
    if (rows.length === 0) paragraph('', 'Not measured: no steps were marked on the clips of these visits.');
    else {
      table(
        [
          { title: 'Measure', width: 150 },
          { title: 'Baseline', width: 70 },
          { title: 'Re-test', width: 70 },
          { title: 'Change', width: 65 },
          { title: 'Against measurement error', width: width - 355 },
        ],
        rows.map((r) => {
          if (r.threshold) sources.set(r.threshold.source, `${r.threshold.source} [${r.threshold.evidence}]`);
          const label = `${r.label}${r.side ? ` (${sideWord(r.side)})` : ''}`;
          const threshold = r.threshold ? ` (threshold ${formatValue(r.threshold.value, r.threshold.unit)})` : '';
          return [label, formatValue(r.baseline, r.unit), formatValue(r.retest, r.unit), r.change === null ? 'Not measured' : signedChange(r.change, r.unit), `${verdictText(r)}${threshold}`];
        }),
      );
    }
  } else if (doc0.measures.every((c) => c.measures.every((m) => m.status !== 'ok'))) {
    paragraph('', 'Not measured: no steps were marked on this visit’s clips, so there are no figures yet.');
  } else {
    for (const clip of doc0.measures) {
      if (doc0.measures.length > 1) {
        ensure(40);
        doc.font('semibold').fontSize(10.5).fillColor(INK).text(clip.heading, MARGIN, doc.y + 4, { width });
        doc.moveDown(0.3);
      }
      const measured = clip.measures.filter((m) => m.status === 'ok');
      if (measured.length === 0) {
        paragraph('', 'Not measured: no steps were marked on this clip.');
        continue;
      }
      table(
        [
          { title: 'Measure', width: 140 },
          { title: 'Mean ± SD (steps)', width: 95 },
          { title: 'Reference band', width: 75 },
          { title: 'Where it sits', width: 55 },
          { title: 'Source', width: width - 365 },
        ],
        measured.map((m) => {
          if (m.band) sources.set(m.band.band.source, `${m.band.band.source} [${m.band.band.evidence}]`);
          const label = `${m.label}${m.side ? ` (${sideWord(m.side)})` : ''}`;
          return [label, `${formatMeasure(m)} (n = ${m.n})`, m.band ? pdfSafe(bandRange(m.band.band)) : 'None', m.band ? POSITION_TEXT[m.band.position] : '', m.band ? m.band.band.source : ''];
        }),
      );
      const missing = clip.measures.length - measured.length;
      if (missing > 0) {
        doc.font('italic').fontSize(9).fillColor(MUTED).text(`${missing} further ${missing === 1 ? 'measure was' : 'measures were'} not measured (no marked steps) and ${missing === 1 ? 'is' : 'are'} left out.`, MARGIN, doc.y + 4, { width });
      }
    }
  }
  await onProgress?.(0.3);

  // ── Stills ──
  if (doc0.stills.length) {
    heading('Annotated stills');
    for (const [i, still] of doc0.stills.entries()) {
      // Two stills fit a page; the caption is part of the rendered image.
      const scale = Math.min(width / still.width, 300 / still.height);
      const w = still.width * scale;
      const h = still.height * scale;
      ensure(h + 14);
      const y = doc.y + 4;
      doc.image(still.image, MARGIN + (width - w) / 2, y, { width: w, height: h });
      doc.rect(MARGIN + (width - w) / 2, y, w, h).lineWidth(0.5).strokeColor(RULE).stroke();
      doc.x = MARGIN;
      doc.y = y + h + 10;
      await onProgress?.(0.3 + (0.5 * (i + 1)) / doc0.stills.length);
    }
  }

  // ── Plan ──
  heading('Plan');
  paragraph(doc0.planText, 'No plan written for this visit.');

  // ── Sources ──
  if (sources.size) {
    heading('Sources of reference bands and thresholds');
    doc.font('regular').fontSize(9).fillColor(INK);
    for (const s of [...sources.values()].sort()) {
      ensure(20);
      doc.text(`• ${s}`, MARGIN, doc.y, { width });
    }
    doc.font('italic').fontSize(8.5).fillColor(MUTED).text('[pub] as published · [mem] from memory, check before clinical use · [trade] common practice · [calc] derived from a published figure', MARGIN, doc.y + 4, { width });
  }

  // ── Footer on every page ──
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    const y = doc.page.height - MARGIN + 2;
    // Writing in the bottom margin must not start a new page.
    const savedBottom = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    doc.font('regular').fontSize(8).fillColor(MUTED).text(`${doc0.athleteName} · ${doc0.title} · ${doc0.clinicName} · page ${i + 1} of ${range.count}`, MARGIN, y, { width, align: 'center', lineBreak: false });
    doc.page.margins.bottom = savedBottom;
  }
  doc.end();
  await ended;
  await onProgress?.(1);
  return { pdf: Buffer.concat(chunks), pageCount: range.count };
}
