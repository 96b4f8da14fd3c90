/**
 * Benchmark: following six tape markers over a 1280-wide 120 fps clip in Node on one core
 * (OpenCV's WebAssembly build is single-threaded). Target ≥ 120 frames per second, i.e. faster
 * than real time for 120 fps video. Side by side in the same run: the clip's own decode speed
 * (ffmpeg to grey frames on one thread), and the accuracy of the followed points against the
 * ground truth. The clip is a synthetic fixture (scripts/demo-clip) with every realism option on
 * (textured wall, motion blur, compression noise, flicker, occlusion of far markers, camera shake).
 *
 *   npx tsx test/bench/follow-markers.ts [--seconds 2] [--clip file.mp4 (with its .ground-truth.json)]
 */
import { execFile } from 'node:child_process';
import { readFile, mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { parseArgs } from 'node:util';
import { ALL_REALISM, generateRunnerClip, groundTruthPath, type GroundTruth } from '../../scripts/demo-clip/clip';
import { anglesFromPixels, type SideLandmarkSet } from '../../scripts/demo-clip/ground-truth';
import { decodeGray } from '../../server/follow/gray-decode';
import { followMarkers } from '../../server/follow/marker-follower';
import { loadOpenCv } from '../../server/follow/opencv';
import { RIGID_LINKS } from '../../server/follow/rigid-links';
import { memoryReader, NEAR_MARKERS, pointErrors, quantile } from '../server/follow/follow-fixture';

const { values: args } = parseArgs({ options: { seconds: { type: 'string', default: '2' }, clip: { type: 'string' } } });
const TARGET_FPS = 120;
const pad = (fps: number) => fps.toFixed(0).padStart(5);

/** CPU seconds (user + system) ffmpeg reports with -benchmark for a run. */
function ffmpegCpuSeconds(args: string[]): Promise<number> {
  return new Promise((resolve, reject) => {
    execFile(process.env['FFMPEG_PATH'] ?? 'ffmpeg', ['-hide_banner', '-benchmark', ...args], (err, _out, stderr) => {
      if (err) return reject(err);
      const m = /utime=([\d.]+)s stime=([\d.]+)s/.exec(stderr);
      if (!m) return reject(new Error('ffmpeg printed no -benchmark line'));
      resolve(Number(m[1]) + Number(m[2]));
    });
  });
}

const dir = await mkdtemp(path.join(os.tmpdir(), 'tf-follow-bench-'));
try {
  let file = args.clip;
  let truth: GroundTruth;
  if (file) truth = JSON.parse(await readFile(groundTruthPath(file), 'utf8')) as GroundTruth;
  else {
    file = path.join(dir, 'runner.mp4');
    console.log(`rendering a ${args.seconds} s synthetic fixture clip (1280×720, 120 fps, all realism options on)…`);
    truth = await generateRunnerClip({
      outFile: file,
      fps: 120,
      width: 1280,
      height: 720,
      seconds: Number(args.seconds),
      hipExtensionDeg: 10,
      facing: 'right',
      preset: 'ultrafast',
      realism: ALL_REALISM,
    });
  }

  // The clip's own decode speed: ffmpeg on one thread, straight to grey frames. CPU seconds
  // (ffmpeg's own -benchmark utime + stime) as well as wall time, since the machine may be shared.
  const t0 = performance.now();
  const frames = await decodeGray(['-threads', '1', '-i', file], truth.width, truth.height);
  const decodeFps = frames.length / ((performance.now() - t0) / 1000);
  const decodeCpuS = await ffmpegCpuSeconds(['-threads', '1', '-i', file, '-f', 'rawvideo', '-pix_fmt', 'gray', '-y', '/dev/null']);

  const cv = await loadOpenCv();
  const start = Math.floor(frames.length / 2);
  const markers = NEAR_MARKERS.map((key) => ({ key, start: truth.frames[start]!.landmarks.near[key] }));
  const t1 = performance.now();
  const cpu0 = process.cpuUsage();
  const result = await followMarkers(cv, memoryReader(frames), {
    startFrame: start,
    from: 0,
    to: frames.length - 1,
    markers,
    links: RIGID_LINKS,
  });
  const followFps = (frames.length - 1) / ((performance.now() - t1) / 1000);
  const cpu = process.cpuUsage(cpu0);
  const followCpuFps = (frames.length - 1) / ((cpu.user + cpu.system) / 1e6);
  const decodeCpuFps = frames.length / decodeCpuS;

  const errors = NEAR_MARKERS.flatMap((key) => pointErrors(truth, 'near', key, result.points.get(key)!));
  const byFrame = new Map<number, Partial<SideLandmarkSet>>();
  for (const key of NEAR_MARKERS) for (const p of result.points.get(key)!) byFrame.set(p.frame, { ...byFrame.get(p.frame), [key]: p });
  const sq = { thighDeg: 0, kneeFlexionDeg: 0, footDeg: 0 };
  let n = 0;
  for (const [frame, set] of byFrame) {
    if (Object.keys(set).length < 6) continue;
    const got = anglesFromPixels(set as SideLandmarkSet, truth.facing);
    for (const k of Object.keys(sq) as Array<keyof typeof sq>) sq[k] += (got[k] - truth.angles[frame]!.near[k]) ** 2;
    n++;
  }
  const rmse = (k: keyof typeof sq) => Math.sqrt(sq[k] / Math.max(1, n)).toFixed(2);

  console.log(`clip: ${frames.length} frames, ${truth.width}×${truth.height} at ${truth.fps} fps (synthetic fixture, all realism on)`);
  console.log(`                                     wall clock      CPU time (one core)`);
  console.log(`decode (ffmpeg, 1 thread, to grey):  ${pad(decodeFps)} fps      ${pad(decodeCpuFps)} fps`);
  console.log(`follow six markers (Node, 1 core):   ${pad(followFps)} fps      ${pad(followCpuFps)} fps   (target ≥ ${TARGET_FPS})`);
  console.log(
    `follow ÷ decode:                     ${(followFps / decodeFps).toFixed(2)} ×         ${(followCpuFps / decodeCpuFps).toFixed(2)} ×`,
  );
  console.log(
    `accuracy: median ${quantile(errors, 0.5).toFixed(2)} px, 95th percentile ${quantile(errors, 0.95).toFixed(2)} px over ${errors.length} points (targets ≤ 2 / ≤ 5 px)`,
  );
  console.log(
    `angles RMSE over ${n} frames: hip ${rmse('thighDeg')}°, knee ${rmse('kneeFlexionDeg')}°, foot ${rmse('footDeg')}° (target ≤ 2°)`,
  );
  console.log(`low-confidence frames: ${result.lowConfidenceFrames.length}`);
} finally {
  await rm(dir, { recursive: true, force: true });
}
