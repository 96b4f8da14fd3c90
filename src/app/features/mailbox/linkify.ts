/** A piece of plain text: either text to show as is, or a web address to show as a link. */
export type TextSegment = { kind: 'text'; text: string } | { kind: 'link'; text: string; href: string };

/** http(s) addresses; trailing punctuation that usually ends a sentence is left out. */
const URL_PATTERN = /\bhttps?:\/\/[^\s<>"']+/gi;
const TRAILING = /[.,;:!?)\]}'"]+$/;

/**
 * Splits plain text into text and link segments so a template can render links as `<a>`
 * elements and everything else as text. Nothing is ever interpreted as HTML.
 */
export function linkify(text: string): TextSegment[] {
  const segments: TextSegment[] = [];
  let last = 0;
  for (const match of text.matchAll(URL_PATTERN)) {
    const start = match.index ?? 0;
    let url = match[0];
    const trailing = TRAILING.exec(url);
    if (trailing) url = url.slice(0, url.length - trailing[0].length);
    if (!url.match(/^https?:\/\/[^/?#]+/i)) continue;
    if (start > last) segments.push({ kind: 'text', text: text.slice(last, start) });
    segments.push({ kind: 'link', text: url, href: url });
    last = start + url.length;
  }
  if (last < text.length) segments.push({ kind: 'text', text: text.slice(last) });
  return segments;
}

/**
 * The in-app path of `href` when it points at this app's own origin (so the link can be
 * followed without reloading), else null.
 */
export function sameOriginPath(href: string, origin: string): string | null {
  try {
    const url = new URL(href);
    return url.origin === origin ? `${url.pathname}${url.search}${url.hash}` : null;
  } catch {
    return null;
  }
}
