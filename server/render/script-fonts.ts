import bidiFactory from 'bidi-js';
import { createRequire } from 'node:module';
import path from 'node:path';

/**
 * Bundled faces for scripts Source Sans 3 does not cover (npm @embedpdf/fonts-*, Noto, SIL OFL):
 * Chinese and Japanese (one Noto Sans S Chinese face, which also has kana and Japanese kanji),
 * Hebrew and Arabic. They are opened only when a string needs them, so Latin documents cost nothing more.
 */
const require = createRequire(import.meta.url);
const fontsDir = (pkg: string) => path.join(path.dirname(require.resolve(pkg)), '..', 'fonts');

/** A fallback face: which code points send text to it, and its files by weight. */
export interface ScriptFont {
  /** pdfkit registration name and canvas family name. */
  readonly name: string;
  /** Whether the face is the one to try for a code point (its script's blocks; the face's own cmap decides after). */
  readonly claims: (cp: number) => boolean;
  readonly regular: string;
  readonly bold: string;
}

const inRanges = (ranges: readonly (readonly [number, number])[]) => (cp: number) => ranges.some(([a, b]) => cp >= a && cp <= b);

export const SCRIPT_FONTS: readonly ScriptFont[] = [
  {
    name: 'Trailframe Hebrew',
    claims: inRanges([
      [0x0590, 0x05ff],
      [0xfb1d, 0xfb4f],
    ]),
    regular: path.join(fontsDir('@embedpdf/fonts-hebrew'), 'NotoSansHebrew-Regular.ttf'),
    bold: path.join(fontsDir('@embedpdf/fonts-hebrew'), 'NotoSansHebrew-Bold.ttf'),
  },
  {
    name: 'Trailframe Arabic',
    claims: inRanges([
      [0x0600, 0x06ff],
      [0x0750, 0x077f],
      [0x08a0, 0x08ff],
      [0xfb50, 0xfdff],
      [0xfe70, 0xfeff],
    ]),
    regular: path.join(fontsDir('@embedpdf/fonts-arabic'), 'NotoNaskhArabic-Regular.ttf'),
    bold: path.join(fontsDir('@embedpdf/fonts-arabic'), 'NotoNaskhArabic-Bold.ttf'),
  },
  {
    // One 8 MB face for both weights: bold CJK would load a second 8 MB file for a heading.
    name: 'Trailframe CJK',
    claims: inRanges([
      [0x2e80, 0x9fff],
      [0xf900, 0xfaff],
      [0xfe30, 0xfe4f],
      [0xff00, 0xffef],
      [0x20000, 0x2ffff],
    ]),
    regular: path.join(fontsDir('@embedpdf/fonts-sc'), 'NotoSansHans-Regular.otf'),
    bold: path.join(fontsDir('@embedpdf/fonts-sc'), 'NotoSansHans-Regular.otf'),
  },
];

/** Whether any code point of `text` belongs to a {@link SCRIPT_FONTS} script (a fast test for the Latin path). */
export function needsScriptFonts(text: string): boolean {
  for (const ch of text) {
    const cp = ch.codePointAt(0)!;
    if (cp >= 0x0590 && SCRIPT_FONTS.some((f) => f.claims(cp))) return true;
  }
  return false;
}

/** A piece of text drawn with one face: `font` is the index into the faces given to {@link splitRuns}. */
export interface TextRun {
  text: string;
  font: number;
  /** Whether the piece is right-to-left (its letters go right to left; fontkit lays RTL scripts out so itself). */
  rtl: boolean;
}

const RTL_CHAR = /[\u0590-\u08ff\ufb1d-\ufdff\ufe70-\ufeff]/;
/** Marks, joiners and variation selectors: drawn with the face of the character before. */
const joinsPrevious = (cp: number) =>
  cp === 0x200c || cp === 0x200d || (cp >= 0xfe00 && cp <= 0xfe0f) || /^\p{M}$/u.test(String.fromCodePoint(cp));

let bidi: ReturnType<typeof bidiFactory> | undefined;

/**
 * Splits one line of text into runs in visual (left-to-right drawing) order, each drawn with the
 * first face that has its characters: `covers[i](cp)` tells whether face i has a glyph (face 0 is the
 * document's own, and takes what no face has). Marks and joiners stay with the character before.
 * Right-to-left text is ordered by the Unicode bidirectional algorithm (bidi-js); a right-to-left run
 * of letters keeps logical order (the font engine reverses and joins it), other right-to-left runs
 * (punctuation between Hebrew words) are reversed here with mirrored brackets.
 */
export function splitRuns(text: string, covers: readonly ((cp: number) => boolean)[]): TextRun[] {
  const units: { start: number; end: number; font: number }[] = [];
  for (let i = 0; i < text.length;) {
    const cp = text.codePointAt(i)!;
    const len = cp > 0xffff ? 2 : 1;
    let font = 0;
    if (units.length && joinsPrevious(cp)) font = units[units.length - 1]!.font;
    else if (!covers[0]!(cp))
      font = Math.max(
        0,
        covers.findIndex((c, f) => f > 0 && c(cp)),
      );
    units.push({ start: i, end: i + len, font });
    i += len;
  }
  const rtl = RTL_CHAR.test(text);
  let levels: Uint8Array | undefined;
  let mirrored: Map<number, string> | undefined;
  if (rtl) {
    bidi ??= bidiFactory();
    const embedding = bidi.getEmbeddingLevels(text);
    levels = embedding.levels;
    mirrored = bidi.getMirroredCharactersMap(text, embedding.levels);
  }
  const level = (i: number) => levels?.[i] ?? 0;
  const runs: (TextRun & { level: number; start: number })[] = [];
  for (const u of units) {
    const last = runs[runs.length - 1];
    if (last && last.font === u.font && last.level === level(u.start)) last.text += text.slice(u.start, u.end);
    else
      runs.push({ text: text.slice(u.start, u.end), font: u.font, rtl: level(u.start) % 2 === 1, level: level(u.start), start: u.start });
  }
  if (!rtl) return runs.map(({ text: t, font, rtl: r }) => ({ text: t, font, rtl: r }));
  // Rule L2: from the highest level down to the lowest odd one, reverse every stretch at that level or above.
  const max = Math.max(...runs.map((r) => r.level));
  const lowestOdd = Math.min(...runs.map((r) => r.level).filter((l) => l % 2 === 1));
  for (let l = max; l >= lowestOdd; l--) {
    for (let i = 0; i < runs.length;) {
      if (runs[i]!.level < l) {
        i++;
        continue;
      }
      let j = i;
      while (j < runs.length && runs[j]!.level >= l) j++;
      runs.splice(i, j - i, ...runs.slice(i, j).reverse());
      i = j;
    }
  }
  return runs.map((r) => {
    if (!r.rtl || RTL_CHAR.test(r.text)) return { text: r.text, font: r.font, rtl: r.rtl };
    const chars = [...r.text].map((ch, k) => mirrored!.get(r.start + k) ?? ch);
    return { text: chars.reverse().join(''), font: r.font, rtl: true };
  });
}
