import { createRequire } from 'node:module';
import path from 'node:path';
import type * as NapiCanvas from '@napi-rs/canvas';
import { addScriptFallback } from './pdf-script-text';
import { needsScriptFonts, SCRIPT_FONTS } from './script-fonts';

/**
 * The shipped Source Sans 3 faces for server-side rendering: @napi-rs/canvas stills use the web
 * app's own files (@fontsource/source-sans-3), pdfkit documents the complete family (npm
 * `source-sans`); both fall back to bundled faces for Hebrew, Arabic, Chinese and Japanese
 * (`script-fonts.ts`). Never a CDN font, so a still or PDF looks the same on every machine.
 */
const require = createRequire(import.meta.url);
const filesDir = path.join(path.dirname(require.resolve('@fontsource/source-sans-3/package.json')), 'files');

/** One web subset of a face, WOFF: both fontkit (pdfkit) and Skia (@napi-rs/canvas) read it. */
function face(weight: 400 | 600 | 700, style: 'normal' | 'italic' = 'normal', subset = 'latin'): string {
  return path.join(filesDir, `source-sans-3-${subset}-${weight}-${style}.woff`);
}

/** The four faces stills and clips use (regular, semibold, bold, italic) of one subset. */
const subsetFaces = (subset: string) => [
  face(400, 'normal', subset),
  face(600, 'normal', subset),
  face(700, 'normal', subset),
  face(400, 'italic', subset),
];

/** The web app's Latin-subset faces by role (what stills draw with). */
export const FONT_FILES = {
  regular: face(400),
  semibold: face(600),
  bold: face(700),
  italic: face(400, 'italic'),
} as const;

/**
 * The web app's other Source Sans 3 subsets, each a family of its own right after the Latin one in
 * {@link CANVAS_FONT_STACK}: accented Latin (Ł, ğ, ő), Greek and Cyrillic letters of captions and
 * names are drawn with them, the same on every machine, instead of a system font that has them (a
 * bare machine drew boxes). Latin text keeps the Latin subset's exact pixels (the first family has it).
 */
const SUBSET_FAMILIES = ['latin-ext', 'greek', 'greek-ext', 'cyrillic', 'cyrillic-ext'].map((subset) => ({
  family: `Source Sans 3 ${subset}`,
  files: subsetFaces(subset),
}));

/**
 * The complete Source Sans 3 faces (npm `source-sans`, Adobe's release, TrueType) by role, for PDFs:
 * the web subsets lack signs a document prints (≥, ≤, →) and letters of names outside basic Latin
 * (Ł, ğ, Greek, Cyrillic); pdfkit embeds only the glyphs a document uses.
 */
const fullDir = path.join(path.dirname(require.resolve('source-sans/package.json')), 'TTF');
export const PDF_FONT_FILES = {
  regular: path.join(fullDir, 'SourceSans3-Regular.ttf'),
  semibold: path.join(fullDir, 'SourceSans3-Semibold.ttf'),
  bold: path.join(fullDir, 'SourceSans3-Bold.ttf'),
  italic: path.join(fullDir, 'SourceSans3-It.ttf'),
} as const;

/** The CSS family name the overlay asks for (matches `DEFAULT_OVERLAY_FONT`). */
export const CANVAS_FONT_FAMILY = 'Source Sans 3';

/**
 * The family list stills and clips draw with: Source Sans 3 (Latin, then its accented Latin, Greek and
 * Cyrillic subsets), then the bundled Hebrew, Arabic and CJK faces ({@link SCRIPT_FONTS}) for the characters it lacks. Skia picks the face per character and lays
 * right-to-left text out by the bidi algorithm itself; never a system font.
 */
export const CANVAS_FONT_STACK = [CANVAS_FONT_FAMILY, ...SUBSET_FAMILIES.map((f) => f.family), ...SCRIPT_FONTS.map((f) => f.name)]
  .map((f) => `"${f}"`)
  .join(', ');

/** Every bundled family of {@link CANVAS_FONT_STACK} with its files (the script faces registered on first need). */
export const CANVAS_FACES: readonly { family: string; files: readonly string[] }[] = [
  { family: CANVAS_FONT_FAMILY, files: Object.values(FONT_FILES) },
  ...SUBSET_FAMILIES,
  ...SCRIPT_FONTS.map((f) => ({ family: f.name, files: [...new Set([f.regular, f.bold])] })),
];

let canvasModule: Promise<typeof NapiCanvas> | undefined;
let scriptFontsRegistered = false;

/**
 * @napi-rs/canvas with the Source Sans 3 faces registered, loaded on first use: Skia stays out of the
 * memory of a server that has drawn nothing yet (an idle web process, one receiving uploads). When one of
 * `texts` (captions, headings) needs them, the script faces are registered too, once per process.
 */
export async function loadCanvas(texts: Iterable<string> = []): Promise<typeof NapiCanvas> {
  canvasModule ??= import('@napi-rs/canvas').then((canvas) => {
    for (const file of Object.values(FONT_FILES)) canvas.GlobalFonts.registerFromPath(file, CANVAS_FONT_FAMILY);
    for (const f of SUBSET_FAMILIES) for (const file of f.files) canvas.GlobalFonts.registerFromPath(file, f.family);
    return canvas;
  });
  const canvas = await canvasModule;
  if (!scriptFontsRegistered && [...texts].some(needsScriptFonts)) {
    for (const f of SCRIPT_FONTS) for (const file of new Set([f.regular, f.bold])) canvas.GlobalFonts.registerFromPath(file, f.name);
    scriptFontsRegistered = true;
  }
  return canvas;
}

/** Registers the complete faces ({@link PDF_FONT_FILES}) on a pdfkit document as `regular`, `semibold`, `bold`, `italic`. */
export function registerPdfFonts(doc: { registerFont(name: string, src: string): unknown }): void {
  for (const [name, file] of Object.entries(PDF_FONT_FILES)) doc.registerFont(name, file);
}

/**
 * Once a burst of drawing is over: empties Skia's caches (glyphs, typefaces' scaler data, decoded
 * images) and, when the process allows it (`--expose-gc`, which `npm start` sets), runs one full
 * garbage collection, so the canvases and image buffers the last stills and summaries left behind
 * are freed now rather than whenever the heap next fills. The next drawing fills the caches again.
 * Nothing happens when nothing was drawn.
 */
export async function releaseDrawingMemory(): Promise<void> {
  if (!canvasModule && !pdfkitModule) return;
  (await canvasModule)?.clearAllCache();
  (globalThis as { gc?: () => void }).gc?.();
}

const importPdfKit = () => import('pdfkit');
let pdfkitModule: ReturnType<typeof importPdfKit> | undefined;

/**
 * A new pdfkit document with the complete faces registered ({@link registerPdfFonts}) and the bundled
 * faces for Chinese, Japanese, Hebrew and Arabic as fallbacks ({@link addScriptFallback}); pdfkit and fontkit are
 * loaded on first use, so a server that has printed nothing yet does not hold them.
 */
export async function newPdfDocument(options: PDFKit.PDFDocumentOptions): Promise<PDFKit.PDFDocument> {
  pdfkitModule ??= importPdfKit();
  const { default: PDFDocument } = await pdfkitModule;
  const doc = new PDFDocument(options);
  registerPdfFonts(doc);
  addScriptFallback(doc);
  return doc;
}
