/** The little of fontkit (pdfkit's font engine) the PDF tests use to check glyph coverage. */
declare module 'fontkit' {
  export interface Font {
    hasGlyphForCodePoint(codePoint: number): boolean;
  }
  export function openSync(path: string): Font;
}
