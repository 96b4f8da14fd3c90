import { needsScriptFonts, SCRIPT_FONTS, splitRuns } from './script-fonts';

/** The parts of a pdfkit font and document this module reaches into (pdfkit has no font fallback of its own). */
interface PdfFont {
  name: string;
  ascender: number;
  font?: { hasGlyphForCodePoint(cp: number): boolean };
}
interface PdfDoc {
  _font: PdfFont;
  _fontSize: number;
  _fontSource: unknown;
  _fontFamily: unknown;
  font(name: string): unknown;
  registerFont(name: string, src: string): unknown;
  widthOfString(text: string, options?: { characterSpacing?: number }): number;
  _fragment(text: string, x: number, y: number, options: FragmentOptions): void;
}
interface FragmentOptions {
  align?: string;
  width?: number;
  lineWidth?: number;
  textWidth?: number;
  wordCount?: number;
  baseline?: number | string;
  characterSpacing?: number;
  [key: string]: unknown;
}

/**
 * Teaches a pdfkit document to print names and captions in Chinese, Japanese, Hebrew and Arabic:
 * each line (pdfkit's `_fragment`) and each measure (`widthOfString`, which wrapping and
 * `heightOfString` use) is split into runs by which face covers each character ({@link splitRuns}),
 * so a run in another script goes out in its bundled face, measured as drawn, with its own
 * ToUnicode map (the text layer keeps every character). Text Source Sans 3 covers takes pdfkit's own
 * path untouched; the script faces are registered here but opened only when a line needs one.
 */
export function addScriptFallback(pdf: unknown): void {
  const doc = pdf as PdfDoc;
  for (const f of SCRIPT_FONTS) {
    doc.registerFont(`${f.name} regular`, f.regular);
    doc.registerFont(`${f.name} bold`, f.bold);
  }
  const width = doc.widthOfString.bind(doc);
  const fragment = doc._fragment.bind(doc);

  /** Runs `fn` with `face` as the current font, then puts the caller's font back. */
  const withFont = <T>(face: string | PdfFont, fn: () => T): T => {
    const saved = { _font: doc._font, _fontSource: doc._fontSource, _fontFamily: doc._fontFamily };
    if (typeof face === 'string') doc.font(face);
    else doc._font = face;
    try {
      return fn();
    } finally {
      Object.assign(doc, saved);
    }
  };
  /** A script face of this document, opened (read and parsed) on first use. */
  const opened = new Map<string, PdfFont>();
  const scriptFace = (i: number, weight: 'regular' | 'bold'): PdfFont => {
    const key = `${SCRIPT_FONTS[i]!.name} ${weight}`;
    let face = opened.get(key);
    if (!face) opened.set(key, (face = withFont(key, () => doc._font)));
    return face;
  };
  const runsOf = (text: string) => {
    const base = doc._font;
    if (!base.font || !needsScriptFonts(text)) return undefined;
    const weight = /bold|semibold|black|heavy/i.test(base.name) ? 'bold' : 'regular';
    const covers = [
      (cp: number) => base.font!.hasGlyphForCodePoint(cp),
      ...SCRIPT_FONTS.map((f, i) => (cp: number) => f.claims(cp) && !!scriptFace(i, weight).font?.hasGlyphForCodePoint(cp)),
    ];
    const runs = splitRuns(text, covers);
    return { base, runs: runs.map((r) => ({ ...r, face: r.font === 0 ? base : scriptFace(r.font - 1, weight) })) };
  };

  doc.widthOfString = (text, options = {}) => {
    const split = runsOf(text);
    if (!split) return width(text, options);
    const sum = split.runs.reduce((w, r) => w + withFont(r.face, () => width(r.text, options)), 0);
    return sum + (options.characterSpacing ?? 0) * (split.runs.length - 1);
  };

  doc._fragment = (text, x, y, options) => {
    const split = runsOf(`${text}`.replace(/\n/g, ''));
    if (!split) return fragment(text, x, y, options);
    if (options.width) {
      if (options.align === 'right') x += (options.lineWidth ?? 0) - doc.widthOfString(`${text}`.replace(/\s+$/, ''), options);
      else if (options.align === 'center')
        x += (options.lineWidth ?? 0) / 2 - (options.textWidth ?? doc.widthOfString(`${text}`, options)) / 2;
    }
    // Every run sits on the line's own baseline (pdfkit would otherwise hang each face by its own ascender).
    const top = options.baseline === undefined || options.baseline === 'top';
    const baseline = top ? -((split.base.ascender / 1000) * doc._fontSize) : options.baseline;
    for (const run of split.runs) {
      const w = withFont(run.face, () => width(run.text, options));
      const trimmed = run.text.trim();
      withFont(run.face, () =>
        fragment(run.text, x, y, {
          ...options,
          align: 'left',
          baseline,
          textWidth: w,
          wordCount: trimmed ? trimmed.split(/\s+/).length : 0,
        }),
      );
      x += w + (options.characterSpacing ?? 0);
    }
  };
}
