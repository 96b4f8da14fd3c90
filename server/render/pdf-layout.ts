/**
 * Page layout of the visit summary on a pdfkit document: headings kept with the start of what they
 * head (never alone at the foot of a page), wrapped paragraphs, and tables that break between rows
 * and repeat their header. Colours and sizes of the document live here too.
 */
import type PDFDocument from 'pdfkit';

export const MARGIN = 50;
export const INK = '#1B2A26';
export const MUTED = '#55645F';
export const SPRUCE = '#1F5C4A';
export const RULE = '#C9D4D0';
export const SHADE = '#EEF3F1';

/** A table column: its title and width in points. */
export interface PdfColumn {
  title: string;
  width: number;
}

/** The layout helpers of one document. */
export interface PdfLayout {
  /** Text width between the margins, points. */
  readonly width: number;
  /** A new page unless `height` more points fit above the bottom margin. */
  ensure(height: number): void;
  /**
   * A section heading, kept with the next `keepWith` points of content: when both do not fit,
   * the heading starts the next page (no heading ever ends a page).
   */
  heading(text: string, keepWith: number): void;
  /** A small heading inside a section (a clip's name), kept with `keepWith` points. */
  subheading(text: string, keepWith: number): void;
  /** Body text, or `empty` in italics when the text is blank. */
  paragraph(text: string, empty: string): void;
  /** Height of the first lines of a paragraph (at most `lines`), to keep a heading with it. */
  paragraphLead(text: string, lines?: number): number;
  /** A table with fixed column widths; wraps cells, breaks pages between rows, repeats the header. */
  table(cols: PdfColumn[], rows: string[][]): void;
  /** Height of a table's header and first row, to keep a heading with it. */
  tableLead(cols: PdfColumn[], rows: string[][]): number;
}

const PAD = 4;

/** Layout helpers over `doc` (fonts `regular`, `semibold`, `italic` registered). */
export function pdfLayout(doc: InstanceType<typeof PDFDocument>): PdfLayout {
  const width = doc.page.width - 2 * MARGIN;
  const bottom = () => doc.page.height - doc.page.margins.bottom;
  const fits = (h: number) => doc.y + h <= bottom();
  const ensure = (h: number) => {
    if (!fits(h)) doc.addPage();
  };
  const atTop = () => doc.y <= doc.page.margins.top + 0.5;

  const rowHeight = (cols: PdfColumn[], cells: string[], head: boolean) => {
    doc.fontSize(head ? 9 : 9.5);
    return (
      Math.max(
        ...cells.map((c, i) =>
          doc.font(head || i === 0 ? 'semibold' : 'regular').heightOfString(c || ' ', { width: cols[i]!.width - 2 * PAD }),
        ),
      ) +
      2 * PAD
    );
  };

  const headingBlock = (text: string, size: number, before: number, after: number) => {
    doc.font('semibold').fontSize(size);
    return before + doc.heightOfString(text, { width }) + after;
  };

  function placeHeading(text: string, size: number, colour: string, keepWith: number, rule: boolean) {
    const before = size * 1.1;
    const after = size * 0.6;
    if (!fits(headingBlock(text, size, atTop() ? 0 : before, after) + keepWith)) doc.addPage();
    if (!atTop()) doc.y += before;
    doc.font('semibold').fontSize(size).fillColor(colour).text(text, MARGIN, doc.y, { width });
    if (rule)
      doc
        .moveTo(MARGIN, doc.y + 2)
        .lineTo(MARGIN + width, doc.y + 2)
        .lineWidth(0.6)
        .strokeColor(RULE)
        .stroke();
    doc.y += after;
    doc.x = MARGIN;
  }

  return {
    width,
    ensure,
    heading: (text, keepWith) => placeHeading(text, 13, SPRUCE, keepWith, true),
    subheading: (text, keepWith) => placeHeading(text, 10.5, INK, keepWith, false),
    paragraph(text, empty) {
      doc
        .font(text.trim() ? 'regular' : 'italic')
        .fontSize(10.5)
        .fillColor(text.trim() ? INK : MUTED);
      doc.text(text.trim() || empty, MARGIN, doc.y, { width, lineGap: 2 });
    },
    paragraphLead(text, lines = 3) {
      doc.font('regular').fontSize(10.5);
      const line = doc.currentLineHeight(true) + 2;
      return Math.min(doc.heightOfString(text.trim() || ' ', { width, lineGap: 2 }), lines * line);
    },
    tableLead(cols, rows) {
      const head = rowHeight(
        cols,
        cols.map((c) => c.title),
        true,
      );
      return head + (rows[0] ? rowHeight(cols, rows[0], false) : 0);
    },
    table(cols, rows) {
      const drawRow = (cells: string[], head: boolean, next: string[] | undefined) => {
        const h = rowHeight(cols, cells, head);
        // A header row goes with the row under it; a body row that does not fit starts a page.
        const need = head && next ? h + rowHeight(cols, next, false) : h;
        if (!fits(need) && !atTop()) {
          doc.addPage();
          if (!head)
            drawRow(
              cols.map((c) => c.title),
              true,
              cells,
            );
        }
        const y = doc.y;
        doc.fontSize(head ? 9 : 9.5);
        if (head) doc.rect(MARGIN, y, width, h).fill(SHADE);
        let x = MARGIN;
        cells.forEach((c, i) => {
          doc.fillColor(head ? SPRUCE : INK).font(head || i === 0 ? 'semibold' : 'regular');
          doc.text(c, x + PAD, y + PAD, { width: cols[i]!.width - 2 * PAD });
          x += cols[i]!.width;
        });
        doc
          .moveTo(MARGIN, y + h)
          .lineTo(MARGIN + width, y + h)
          .lineWidth(0.4)
          .strokeColor(RULE)
          .stroke();
        doc.x = MARGIN;
        doc.y = y + h;
      };
      drawRow(
        cols.map((c) => c.title),
        true,
        rows[0],
      );
      rows.forEach((r) => drawRow(r, false, undefined));
    },
  };
}
