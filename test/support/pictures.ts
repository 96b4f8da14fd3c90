/**
 * Pictures made for picture tests: a photo with a marked corner, EXIF blocks (orientation, GPS,
 * camera) written with piexifjs, and hostile files (a GIF bomb, a header lying about its size).
 */
import { Jimp } from 'jimp';
import piexif from 'piexifjs';

/** Colour of the marked corner (pure red) and of the rest (mid grey). */
export const MARK = { r: 255, g: 0, b: 0 };

/**
 * A `width`×`height` JPEG, grey, with a red square of `mark` px in its stored top-left corner.
 */
export async function markedJpeg(width: number, height: number, mark = 40): Promise<Buffer> {
  const img = new Jimp({ width, height, color: 0x808080ff });
  for (let y = 0; y < mark; y++) for (let x = 0; x < mark; x++) img.setPixelColor(0xff0000ff, x, y);
  return img.getBuffer('image/jpeg', { quality: 95 });
}

/** Adds EXIF with the given orientation, GPS position and camera make/model (piexifjs). */
export function withExif(jpeg: Buffer, orientation: number): Buffer {
  const exif = {
    '0th': {
      [piexif.ImageIFD.Orientation]: orientation,
      [piexif.ImageIFD.Make]: 'Testcam',
      [piexif.ImageIFD.Model]: 'Model 9',
    },
    GPS: {
      [piexif.GPSIFD.GPSLatitudeRef]: 'N',
      [piexif.GPSIFD.GPSLatitude]: [
        [47, 1],
        [30, 1],
        [0, 1],
      ],
      [piexif.GPSIFD.GPSLongitudeRef]: 'E',
      [piexif.GPSIFD.GPSLongitude]: [
        [8, 1],
        [30, 1],
        [0, 1],
      ],
    },
  };
  const bytes = piexif.dump(exif);
  return Buffer.from(piexif.insert(bytes, jpeg.toString('binary')), 'binary');
}

/** An XMP packet (APP1) and an IPTC block (APP13) inserted after SOI. */
export function withXmpAndIptc(jpeg: Buffer): Buffer {
  const xmpBody = Buffer.from(
    'http://ns.adobe.com/xap/1.0/\0<x:xmpmeta xmlns:x="adobe:ns:meta/"><rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#"><rdf:Description xmlns:dc="http://purl.org/dc/elements/1.1/" dc:creator="Someone"/></rdf:RDF></x:xmpmeta>',
    'latin1',
  );
  const iptcBody = Buffer.concat([
    Buffer.from('Photoshop 3.0\0', 'latin1'),
    Buffer.from('8BIM', 'latin1'),
    Buffer.from([0x04, 0x04, 0, 0]),
    (() => {
      const data = Buffer.concat([Buffer.from([0x1c, 0x02, 0x50, 0x00, 0x07]), Buffer.from('Someone', 'latin1')]);
      const len = Buffer.alloc(4);
      len.writeUInt32BE(data.length);
      return Buffer.concat([len, data, data.length % 2 ? Buffer.from([0]) : Buffer.alloc(0)]);
    })(),
  ]);
  const segment = (marker: number, body: Buffer) => {
    const head = Buffer.from([0xff, marker, 0, 0]);
    head.writeUInt16BE(body.length + 2, 2);
    return Buffer.concat([head, body]);
  };
  return Buffer.concat([jpeg.subarray(0, 2), segment(0xe1, xmpBody), segment(0xed, iptcBody), jpeg.subarray(2)]);
}

/** A JPEG whose frame header (SOF) is rewritten to declare `width`×`height`. */
export function jpegDeclaring(jpeg: Buffer, width: number, height: number): Buffer {
  const out = Buffer.from(jpeg);
  for (let at = 2; at + 9 < out.length;) {
    if (out[at] !== 0xff) break;
    const marker = out[at + 1]!;
    const len = out.readUInt16BE(at + 2);
    if (marker >= 0xc0 && marker <= 0xc3) {
      out.writeUInt16BE(height, at + 5);
      out.writeUInt16BE(width, at + 7);
      return out;
    }
    at += 2 + len;
  }
  throw new Error('no SOF marker');
}

/** A 200-byte GIF whose screen and one frame declare 30000×30000 pixels (a decompression bomb). */
export function gifBomb(side = 30000): Buffer {
  const head = Buffer.alloc(13);
  head.write('GIF89a', 0, 'latin1');
  head.writeUInt16LE(side, 6);
  head.writeUInt16LE(side, 8);
  head[10] = 0x80; // global colour table of 2 entries
  const gct = Buffer.from([0, 0, 0, 255, 255, 255]);
  const desc = Buffer.alloc(10);
  desc[0] = 0x2c;
  desc.writeUInt16LE(side, 5);
  desc.writeUInt16LE(side, 7);
  const data = Buffer.from([0x02, 0x04, 0x84, 0x8f, 0xa9, 0x00, 0x00, 0x3b]);
  return Buffer.concat([head, gct, desc, data]);
}
