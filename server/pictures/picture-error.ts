import { AppError } from '../errors';

/**
 * Why a picture was refused, as the API answers it (422 unless said otherwise):
 * - `empty_file`: zero bytes.
 * - `not_picture`: not a JPEG, PNG or GIF by its first bytes (text named `.jpg`, a video, …).
 * - `svg_refused`: an SVG (it can carry script).
 * - `too_many_pixels`: the header declares more pixels than we decode (checked before decoding).
 * - `truncated`: a JPEG or PNG that ends early.
 * - `undecodable`: the bytes look like a picture but do not decode.
 * - `too_large`: the file is over the size limit (413).
 */
export type PictureErrorCode = 'empty_file' | 'not_picture' | 'svg_refused' | 'too_many_pixels' | 'truncated' | 'undecodable' | 'too_large';

export class PictureError extends AppError {
  declare readonly code: PictureErrorCode;

  constructor(code: PictureErrorCode, message: string) {
    super(code === 'too_large' ? 413 : 422, code, message);
  }
}
