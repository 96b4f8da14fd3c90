import { describe, expect, it } from 'vitest';
import { sniffContainer } from '../../../server/media/magic';

/** An ISO-BMFF `ftyp` box: size, 'ftyp', major brand, minor version, compatible brands. */
function ftyp(major: string, compatible: string[] = [], trailing = 'mdat'): Buffer {
  const size = 16 + 4 * compatible.length;
  const box = Buffer.alloc(size);
  box.writeUInt32BE(size, 0);
  box.write('ftyp', 4, 'latin1');
  box.write(major, 8, 'latin1');
  box.writeUInt32BE(0x200, 12);
  compatible.forEach((c, i) => box.write(c, 16 + 4 * i, 'latin1'));
  const next = Buffer.from([0, 0, 0, 8, ...Buffer.from(trailing, 'latin1')]);
  return Buffer.concat([box, next]);
}

/** An EBML header with a DocType element (ID 0x4282), sizes as one-byte vints. */
function ebml(docType: string, withVersionFirst = true): Buffer {
  const doc = Buffer.from(docType, 'latin1');
  const children = [
    ...(withVersionFirst ? [0x42, 0x86, 0x81, 0x01] : []), // EBMLVersion = 1
    0x42,
    0x82,
    0x80 | doc.length,
    ...doc, // DocType
    0x42,
    0x87,
    0x81,
    0x04, // DocTypeVersion = 4
  ];
  return Buffer.from([0x1a, 0x45, 0xdf, 0xa3, 0x80 | children.length, ...children, 0x18, 0x53, 0x80, 0x67]);
}

function riff(form: string): Buffer {
  const b = Buffer.alloc(24);
  b.write('RIFF', 0, 'latin1');
  b.writeUInt32LE(1000, 4);
  b.write(form, 8, 'latin1');
  b.write('LIST', 12, 'latin1');
  return b;
}

describe('sniffContainer (hand-made magic bytes)', () => {
  it.each([
    ['isom', ['isom', 'iso2', 'avc1', 'mp41'], 'mp4'],
    ['mp42', ['mp42', 'isom'], 'mp4'],
    ['M4V ', ['M4V ', 'M4A ', 'mp42', 'isom'], 'mp4'],
    ['qt  ', ['qt  '], 'mov'],
    ['3gp4', ['isom', '3gp4'], '3gp'],
    ['3g2a', ['3g2a'], '3gp'],
    ['XAVC', ['XAVC', 'mp42', 'iso2'], 'mp4'],
    ['avc1', ['qt  '], 'mov'],
  ] as const)('ftyp major brand %s → %s', (major, compatible, expected) => {
    expect(sniffContainer(ftyp(major, [...compatible]))).toBe(expected);
  });

  it('ISO-BMFF still-image brands (HEIF, AVIF) are not video', () => {
    expect(sniffContainer(ftyp('heic', ['mif1', 'heic']))).toBeNull();
    expect(sniffContainer(ftyp('mif1', ['mif1', 'heic', 'miaf']))).toBeNull();
    expect(sniffContainer(ftyp('avif', ['avif', 'mif1', 'miaf']))).toBeNull();
  });

  it('old QuickTime files starting with a bare moov/mdat/wide atom are mov', () => {
    for (const atom of ['moov', 'mdat', 'wide', 'free']) {
      const b = Buffer.alloc(16);
      b.writeUInt32BE(8, 0);
      b.write(atom, 4, 'latin1');
      expect(sniffContainer(b)).toBe('mov');
    }
  });

  it('EBML DocType webm → webm, matroska → mkv, other → null', () => {
    expect(sniffContainer(ebml('webm'))).toBe('webm');
    expect(sniffContainer(ebml('matroska'))).toBe('mkv');
    expect(sniffContainer(ebml('matroska', false))).toBe('mkv');
    expect(sniffContainer(ebml('foo'))).toBeNull();
  });

  it('RIFF … AVI → avi; RIFF … WAVE → null', () => {
    expect(sniffContainer(riff('AVI '))).toBe('avi');
    expect(sniffContainer(riff('WAVE'))).toBeNull();
  });

  it('PNG, JPEG, text, empty and short buffers → null', () => {
    expect(sniffContainer(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52]))).toBeNull();
    expect(sniffContainer(Buffer.from([0xff, 0xd8, 0xff, 0xe0, 0, 16, 0x4a, 0x46, 0x49, 0x46, 0, 1]))).toBeNull();
    expect(sniffContainer(Buffer.from('hello, this is not a video at all', 'utf8'))).toBeNull();
    expect(sniffContainer(Buffer.alloc(0))).toBeNull();
    expect(sniffContainer(Buffer.from('ftyp'))).toBeNull();
  });

  it('a truncated EBML header does not throw', () => {
    expect(sniffContainer(ebml('webm').subarray(0, 12))).toBeNull();
  });
});
