/**
 * Decodes video or JPEG frames to 8-bit grey with Debian's ffmpeg (raw frames over a pipe), and a
 * frame reader that decodes a clip in chunks so following backward does not hold the whole clip.
 */
import { spawn } from 'node:child_process';
import type { GrayFrame } from './gray-frame';
import type { FrameReader } from './marker-follower';

/**
 * Runs ffmpeg with `inputArgs` (everything before the output) and returns its frames as grey
 * `width × height` images; `stdin` (for example concatenated JPEGs) is written to its input.
 */
export function decodeGray(inputArgs: string[], width: number, height: number, stdin?: Buffer): Promise<GrayFrame[]> {
  return new Promise((resolve, reject) => {
    const args = ['-hide_banner', '-v', 'error', ...inputArgs, '-f', 'rawvideo', '-pix_fmt', 'gray', '-s', `${width}x${height}`, '-'];
    const child = spawn(process.env['FFMPEG_PATH'] ?? 'ffmpeg', args, { stdio: [stdin ? 'pipe' : 'ignore', 'pipe', 'pipe'] });
    const size = width * height;
    const frames: GrayFrame[] = [];
    let pending: Buffer[] = [];
    let pendingBytes = 0;
    let stderr = '';
    child.stdout!.on('data', (chunk: Buffer) => {
      pending.push(chunk);
      pendingBytes += chunk.length;
      if (pendingBytes < size) return;
      let all = Buffer.concat(pending, pendingBytes);
      while (all.length >= size) {
        frames.push({ width, height, data: new Uint8Array(all.subarray(0, size)) });
        all = all.subarray(size);
      }
      pending = all.length ? [Buffer.from(all)] : [];
      pendingBytes = all.length;
    });
    child.stderr!.on('data', (c: Buffer) => (stderr += c.toString()));
    child.on('error', reject);
    child.on('close', (code) => (code === 0 ? resolve(frames) : reject(new Error(`ffmpeg exited with ${code}: ${stderr.trim()}`))));
    if (stdin) {
      child.stdin!.on('error', () => {});
      child.stdin!.end(stdin);
    }
  });
}

/**
 * A reader that decodes `chunk` frames at a time with `decodeRange(first, count)` and keeps the
 * current chunk: following forward or backward decodes each frame about once.
 */
export function chunkedFrameReader(
  meta: { frameCount: number; width: number; height: number },
  decodeRange: (first: number, count: number) => Promise<GrayFrame[]>,
  chunk = 48,
): FrameReader {
  let cached: { first: number; frames: GrayFrame[] } | null = null;
  let last = -1;
  return {
    ...meta,
    async read(index: number): Promise<GrayFrame> {
      if (!cached || index < cached.first || index >= cached.first + cached.frames.length) {
        // Going backward, decode the chunk that ends at this frame.
        const backward = last >= 0 && index < last;
        const first = Math.max(0, backward ? index - chunk + 1 : index);
        const count = Math.min(chunk, meta.frameCount - first);
        cached = { first, frames: await decodeRange(first, count) };
      }
      last = index;
      const frame = cached.frames[index - cached.first];
      if (!frame) throw new RangeError(`frame ${index} could not be decoded`);
      return frame;
    },
  };
}
