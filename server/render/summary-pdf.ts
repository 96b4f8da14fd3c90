import type { ComparisonRow, Measure, ReferenceBand } from '../../src/contracts/measures';
import { DEFAULT_REFERENCE_BANDS, findBand } from '../../src/kinematics/bands';
import { thresholdText, verdictText } from '../../src/kinematics/comparison';
import { bandRange, formatMeasure, formatValue, sidedLabel } from '../../src/kinematics/format';
import { newPdfDocument } from './fonts';
import { INK, MARGIN, MUTED, pdfLayout } from './pdf-layout';
import { drawLogoTopRight } from './pdf-letterhead';
import type { LogoImage } from '../clinic/clinic-brand';

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
  /** The clinic's logo (PNG with transparency), top right of the first page. */
  clinicLogo?: LogoImage | null;
  /** The clinic's legal name, address, tax number and contact line, under its name. */
  clinicLegalLines?: string[];
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
  /** The clinic's reference bands, for the comparison's band column (default: the cited defaults). */
  bands?: ReferenceBand[];
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

const POSITION_TEXT = { below: 'Below', within: 'Within', above: 'Above' } as const;

/**
 * Text typed by people (names, findings, plan) as the PDF can print it: emoji (with their skin
 * tones, flags, joiners and variation selectors) have no glyph in a text face and would print as
 * boxes, so they are left out; signs such as © or ↔ stay.
 */
export function printable(text: string): string {
  return text.replace(/[\p{Emoji_Presentation}\p{Emoji_Modifier}\p{Regional_Indicator}\uFE0F\u200D]/gu, '');
}

/**
 * A citation as a patient document prints it: plainly, without the evidence tags the app shows
 * ([pub], [mem] …); a figure derived from a published one says how.
 */
export function plainCitation(source: string, evidence: string, derivation?: string): string {
  // Working notes about how a citation was checked ("author list from memory") stay in the app.
  const plain = source.replace(/\s*\([^)]*\bfrom memory\b[^)]*\)/gi, '').trim();
  return evidence === 'calc' && derivation ? `${plain}. ${derivation}` : plain;
}

/** "Heiderscheit et al. 2011" from a full citation: its first part, shortened for a table cell. */
export function shortCitation(source: string): string {
  const first = source.split(/[,;:(]/)[0]!.trim();
  return first.length > 48 ? `${first.slice(0, 47).trimEnd()}…` : first;
}

/** Numbered sources in order of first use; `ref` gives a citation's number. */
function sourceList() {
  const numbers = new Map<string, number>();
  return {
    ref(citation: string): number {
      let n = numbers.get(citation);
      if (n === undefined) numbers.set(citation, (n = numbers.size + 1));
      return n;
    },
    entries: () => [...numbers].map(([text, n]) => ({ n, text })),
  };
}

const labelOf = (m: { label: string; side: 'left' | 'right' | null }) => sidedLabel(m.label, m.side);

/** Renders the visit summary PDF (A4, pdfkit, the complete Source Sans 3 faces). */
export async function renderSummaryPdf(
  doc0: SummaryDocument,
  onProgress?: (f: number) => void | Promise<void>,
): Promise<{ pdf: Buffer; pageCount: number }> {
  const athleteName = printable(doc0.athleteName);
  const clinicName = printable(doc0.clinicName);
  const doc = await newPdfDocument({
    size: 'A4',
    margins: { top: MARGIN, bottom: MARGIN + 20, left: MARGIN, right: MARGIN },
    bufferPages: true,
    info: { Title: `${doc0.title} - ${athleteName}`, Author: clinicName, Creator: 'Trailframe' },
  });
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const ended = new Promise<void>((resolve, reject) => {
    doc.on('end', () => resolve());
    doc.on('error', reject);
  });
  const L = pdfLayout(doc);
  const { width } = L;
  const sources = sourceList();
  const bandCell = (band: ReferenceBand) =>
    `${bandRange(band)}\n${shortCitation(band.source)} [${sources.ref(plainCitation(band.source, band.evidence))}]`;

  // ── Header ──
  const headWidth = width - drawLogoTopRight(doc, doc0.clinicLogo ?? null, MARGIN);
  doc.font('semibold').fontSize(10).fillColor(MUTED).text(clinicName, MARGIN, MARGIN, { width: headWidth });
  const legal = (doc0.clinicLegalLines ?? []).map(printable).filter((l) => l && l !== clinicName);
  if (legal.length) doc.font('regular').fontSize(8).fillColor(MUTED).text(legal.join(' · '), { width: headWidth });
  doc.font('bold').fontSize(22).fillColor(INK).text(doc0.title, { width: headWidth });
  doc.font('regular').fontSize(12).fillColor(INK).text(`Athlete: ${athleteName}`, { width });
  doc
    .font('regular')
    .fontSize(10)
    .fillColor(MUTED)
    .text(`Prepared by ${printable(doc0.coachName)} on ${doc0.issuedOn}`, { width });

  // ── Caution ──
  doc.moveDown(0.8);
  const cautionTop = doc.y;
  doc.font('semibold').fontSize(9.5);
  const cautionH = doc.heightOfString(doc0.caution, { width: width - 20 }) + 16;
  doc.rect(MARGIN, cautionTop, width, cautionH).fill('#FFF6E5');
  doc.fillColor('#6B4A00').text(doc0.caution, MARGIN + 10, cautionTop + 8, { width: width - 20 });
  doc.y = cautionTop + cautionH;

  // ── Visit facts ──
  const factCols = [{ title: '', width: 110 }, ...doc0.visits.map((v) => ({ title: v.label, width: (width - 110) / doc0.visits.length }))];
  const factRows = [
    ['Surface', ...doc0.visits.map((v) => v.surface)],
    ['Speed', ...doc0.visits.map((v) => v.speed)],
    ['Incline', ...doc0.visits.map((v) => v.incline ?? 'Not recorded')],
    ['Shoes', ...doc0.visits.map((v) => printable(v.shoes ?? '') || 'Not recorded')],
  ];
  L.heading(doc0.visits.length > 1 ? 'Visits compared' : 'Visit', L.tableLead(factCols, factRows));
  L.table(factCols, factRows);
  await onProgress?.(0.15);

  // ── Findings ──
  const findings = printable(doc0.findings);
  L.heading('Findings', L.paragraphLead(findings));
  L.paragraph(findings, 'No findings written.');

  // ── Measures ──
  const measuresTitle = doc0.comparison ? 'Measures: Baseline and Re-test' : 'Measures';
  if (doc0.comparison) {
    const rows = doc0.comparison.filter((r) => r.verdict !== 'not_measured' || r.baseline !== null || r.retest !== null);
    const bands = doc0.bands ?? DEFAULT_REFERENCE_BANDS;
    if (rows.length === 0) {
      const empty = 'Not measured: no steps were marked on the clips of these visits.';
      L.heading(measuresTitle, L.paragraphLead(empty));
      L.paragraph('', empty);
    } else {
      const cols = [
        { title: 'Measure', width: 118 },
        { title: 'Baseline', width: 52 },
        { title: 'Re-test', width: 52 },
        { title: 'Change', width: 50 },
        { title: 'Reference band', width: 98 },
        { title: 'Against measurement error', width: width - 370 },
      ];
      const cells = rows.map((r) => {
        const band = findBand(bands, r.key, r.unit);
        const threshold = r.threshold
          ? ` (threshold ${thresholdText(r.threshold)}) [${sources.ref(plainCitation(r.threshold.source, r.threshold.evidence, r.threshold.derivation))}]`
          : '';
        return [
          labelOf(r),
          formatValue(r.baseline, r.unit),
          formatValue(r.retest, r.unit),
          r.change === null ? 'Not measured' : formatValue(r.change, r.unit, { signed: true }),
          band ? bandCell(band) : 'None',
          `${verdictText(r)}${threshold}`,
        ];
      });
      L.heading(measuresTitle, L.tableLead(cols, cells));
      L.table(cols, cells);
    }
  } else if (doc0.measures.every((c) => c.measures.every((m) => m.status !== 'ok'))) {
    const empty = 'Not measured: no steps were marked on this visit’s clips, so there are no figures yet.';
    L.heading(measuresTitle, L.paragraphLead(empty));
    L.paragraph('', empty);
  } else {
    const cols = [
      { title: 'Measure', width: 150 },
      { title: 'Mean ± SD (steps)', width: 105 },
      { title: 'Reference band', width: 150 },
      { title: 'Where it sits', width: width - 405 },
    ];
    doc0.measures.forEach((clip, i) => {
      const measured = clip.measures.filter((m) => m.status === 'ok');
      const rows = measured.map((m) => [
        labelOf(m),
        `${formatMeasure(m)} (n = ${m.n})`,
        m.band ? bandCell(m.band.band) : 'None',
        m.band ? POSITION_TEXT[m.band.position] : '',
      ]);
      const empty = 'Not measured: no steps were marked on this clip.';
      const lead = measured.length ? L.tableLead(cols, rows) : L.paragraphLead(empty);
      const sub = doc0.measures.length > 1 ? 30 : 0;
      if (i === 0) L.heading(measuresTitle, sub + lead);
      if (sub) L.subheading(clip.heading, lead);
      if (measured.length === 0) {
        L.paragraph('', empty);
        return;
      }
      L.table(cols, rows);
      const missing = clip.measures.length - measured.length;
      if (missing > 0) {
        const note = `${missing} further ${missing === 1 ? 'measure was' : 'measures were'} not measured (no marked steps) and ${missing === 1 ? 'is' : 'are'} left out.`;
        doc.font('italic').fontSize(9);
        L.ensure(doc.heightOfString(note, { width }) + 4);
        doc.fillColor(MUTED).text(note, MARGIN, doc.y + 4, { width });
      }
    });
  }
  await onProgress?.(0.3);

  // ── Stills ──
  // Two stills fit a page; the caption is part of the rendered image.
  const placed = doc0.stills.map((still) => {
    const scale = Math.min(width / still.width, 300 / still.height);
    return { still, w: still.width * scale, h: still.height * scale };
  });
  for (const [i, { still, w, h }] of placed.entries()) {
    if (i === 0) L.heading('Annotated stills', h + 14);
    else L.ensure(h + 14);
    const y = doc.y + 4;
    doc.image(still.image, MARGIN + (width - w) / 2, y, { width: w, height: h });
    doc
      .rect(MARGIN + (width - w) / 2, y, w, h)
      .lineWidth(0.5)
      .strokeColor('#C9D4D0')
      .stroke();
    doc.x = MARGIN;
    doc.y = y + h + 10;
    await onProgress?.(0.3 + (0.5 * (i + 1)) / placed.length);
  }

  // ── Plan ──
  const plan = printable(doc0.planText);
  L.heading('Plan', L.paragraphLead(plan));
  L.paragraph(plan, 'No plan written for this visit.');

  // ── Sources ──
  const list = sources.entries();
  if (list.length) {
    doc.font('regular').fontSize(9);
    const item = (e: { n: number; text: string }) => `[${e.n}] ${e.text}`;
    L.heading('Sources of reference bands and thresholds', doc.heightOfString(item(list[0]!), { width }) + 2);
    for (const e of list) {
      doc.font('regular').fontSize(9);
      L.ensure(doc.heightOfString(item(e), { width }) + 2);
      doc.fillColor(INK).text(item(e), MARGIN, doc.y, { width });
      doc.y += 2;
    }
  }

  // ── Footer on every page ──
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    const y = doc.page.height - MARGIN + 2;
    // Writing in the bottom margin must not start a new page.
    const savedBottom = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    doc
      .font('regular')
      .fontSize(8)
      .fillColor(MUTED)
      .text(`${athleteName} · ${doc0.title} · ${clinicName} · page ${i + 1} of ${range.count}`, MARGIN, y, {
        width,
        align: 'center',
        lineBreak: false,
      });
    doc.page.margins.bottom = savedBottom;
  }
  doc.end();
  await ended;
  await onProgress?.(1);
  return { pdf: Buffer.concat(chunks), pageCount: range.count };
}
