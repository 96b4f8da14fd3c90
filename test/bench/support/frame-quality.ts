/**
 * Picture quality of extracted frames, measured by ffmpeg's own `ssim` and `psnr` filters (an
 * outside reference: the benchmark never judges the extraction by its own code).
 */
import { spawn } from 'node:child_process';

/** SSIM (All, 0–1) and PSNR (average, dB; Infinity when identical) of one comparison. */
export interface FrameQuality {
  ssim: number;
  psnrDb: number;
}

function run(argv: string[]): Promise<string> {
  return new Promise((resolve, reject) => {
    const child = spawn('ffmpeg', ['-hide_banner', '-nostats', ...argv], { stdio: ['ignore', 'ignore', 'pipe'] });
    let err = '';
    child.stderr.on('data', (c: Buffer) => (err += c.toString()));
    child.on('close', (code) => (code === 0 ? resolve(err) : reject(new Error(`ffmpeg ${code}: ${err.slice(-2000)}`))));
  });
}

/** Reads ffmpeg's closing `SSIM … All:x` and `PSNR … average:y` lines. */
export function parseQuality(log: string): FrameQuality {
  const ssim = /SSIM .*All:([\d.]+)/.exec(log);
  const psnr = /PSNR .*average:(inf|[\d.]+)/.exec(log);
  if (!ssim || !psnr) throw new Error(`no SSIM/PSNR in ffmpeg's log:\n${log.slice(-1000)}`);
  return { ssim: Number(ssim[1]), psnrDb: psnr[1] === 'inf' ? Infinity : Number(psnr[1]) };
}

/**
 * Compares the first `frames` JPEGs of folder `a` (`000001.jpg …`) with those of folder `b`, or
 * with the source clip itself resized to the same size by zscale's lanczos kernel in full range
 * (`{ clip }`), the best the working size can show. Both sides are converted to planar RGB by
 * ffmpeg (following each side's range tag), so range handling cannot flatter either one.
 */
export async function compareFrames(
  a: string,
  b: string | { clip: string; width: number; height: number },
  frames = 240,
): Promise<FrameQuality> {
  const seq = (dir: string) => ['-framerate', '120', '-i', `${dir}/%06d.jpg`];
  const second = typeof b === 'string' ? seq(b) : ['-i', b.clip];
  const ref =
    typeof b === 'string' ? '[1:v]format=gbrp' : `[1:v]zscale=w=${b.width}:h=${b.height}:f=lanczos:r=full,format=yuv420p,format=gbrp`;
  const log = await run([
    ...seq(a),
    ...second,
    '-lavfi',
    `[0:v]format=gbrp,settb=1/120,setpts=N,split[a0][a1];${ref},settb=1/120,setpts=N,split[b0][b1];[a0][b0]ssim;[a1][b1]psnr`,
    '-frames:v',
    String(frames),
    '-f',
    'null',
    '-',
  ]);
  return parseQuality(log);
}
