/** Containers Trailframe accepts for upload, as told by their first bytes. */
export type ContainerKind = 'mp4' | 'mov' | 'webm' | 'mkv' | 'avi' | '3gp';

/** How many leading bytes {@link sniffContainer} needs at most to decide (read this many). */
export const SNIFF_BYTES = 4096;

/** ISO-BMFF brands that mean a still image or raw photo, not a video. */
const IMAGE_BRANDS = new Set(['heic', 'heix', 'heim', 'heis', 'hevc', 'hevx', 'mif1', 'msf1', 'avif', 'avis', 'jpx ', 'jp2 ', 'crx ']);
/** Top-level QuickTime atoms seen at offset 4 of old `.mov` files that lack an `ftyp` box. */
const BARE_QT_ATOMS = new Set(['moov', 'mdat', 'wide', 'free', 'skip', 'pnot']);

const ascii = (b: Buffer, from: number, to: number) => b.subarray(from, to).toString('latin1');

function brandKind(brand: string): ContainerKind | 'image' | null {
  if (brand === 'qt  ') return 'mov';
  if (brand.startsWith('3gp') || brand.startsWith('3g2')) return '3gp';
  if (IMAGE_BRANDS.has(brand)) return 'image';
  return null;
}

function sniffIsoBmff(b: Buffer): ContainerKind | null {
  const boxSize = b.readUInt32BE(0);
  const major = ascii(b, 8, 12);
  const fromMajor = brandKind(major);
  if (fromMajor === 'image') return null;
  if (fromMajor) return fromMajor;
  const end = Math.min(b.length, boxSize >= 16 ? boxSize : b.length);
  const compatible: string[] = [];
  for (let at = 16; at + 4 <= end; at += 4) compatible.push(ascii(b, at, at + 4));
  const kinds = compatible.map(brandKind);
  // An image brand with no video brand beside it means a still (e.g. HEIF photos list mif1 + heic).
  if (kinds.includes('image') && !compatible.some((c) => /^(iso[2-9m]|mp4[12]|avc1|M4V)/.test(c))) return null;
  if (kinds.includes('mov')) return 'mov';
  if (kinds.includes('3gp')) return '3gp';
  return 'mp4';
}

/** Reads an EBML variable-length integer; `keepMarker` for element IDs. */
function readVint(b: Buffer, at: number, keepMarker: boolean): { value: number; length: number } | null {
  const first = b[at];
  if (first === undefined || first === 0) return null;
  let length = 1;
  while (!(first & (0x80 >> (length - 1)))) length++;
  if (at + length > b.length) return null;
  let value = keepMarker ? first : first & (0xff >> length);
  for (let i = 1; i < length; i++) value = value * 256 + b[at + i]!;
  return { value, length };
}

function sniffEbml(b: Buffer): ContainerKind | null {
  const headerSize = readVint(b, 4, false);
  if (!headerSize) return null;
  let at = 4 + headerSize.length;
  const end = Math.min(b.length, at + headerSize.value);
  while (at < end) {
    const id = readVint(b, at, true);
    if (!id) return null;
    const size = readVint(b, at + id.length, false);
    if (!size) return null;
    const dataAt = at + id.length + size.length;
    if (id.value === 0x4282) {
      const docType = ascii(b, dataAt, Math.min(b.length, dataAt + size.value)).replace(/\0+$/, '');
      if (docType === 'webm') return 'webm';
      if (docType === 'matroska') return 'mkv';
      return null;
    }
    at = dataAt + size.value;
  }
  return null;
}

/**
 * Names the container from the first bytes of a file (pass at least the first {@link SNIFF_BYTES}
 * bytes, or the whole file if shorter). Pure: no I/O.
 *
 * - ISO-BMFF `ftyp` box: major brand `qt  ` → `mov`; `3gp*`/`3g2*` → `3gp`; image brands (HEIF,
 *   AVIF, …) → `null`; any other brand → `mp4` (compatible brands break ties). Old QuickTime files
 *   without `ftyp` (first atom `moov`, `mdat`, `wide`, `free`, `skip`, `pnot`) → `mov`.
 * - EBML `1A 45 DF A3` with DocType `webm` → `webm`, `matroska` → `mkv`.
 * - `RIFF` … `AVI ` → `avi`.
 *
 * Only a first gate: ffprobe still decides whether a video stream is really there.
 */
export function sniffContainer(firstBytes: Buffer): ContainerKind | null {
  const b = firstBytes;
  if (b.length < 12) return null;
  if (ascii(b, 4, 8) === 'ftyp' && b.length >= 12) return sniffIsoBmff(b);
  if (b[0] === 0x1a && b[1] === 0x45 && b[2] === 0xdf && b[3] === 0xa3) return sniffEbml(b);
  if (ascii(b, 0, 4) === 'RIFF' && ascii(b, 8, 12).startsWith('AVI')) return 'avi';
  if (BARE_QT_ATOMS.has(ascii(b, 4, 8)) && b.readUInt32BE(0) >= 8) return 'mov';
  return null;
}
