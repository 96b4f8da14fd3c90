/**
 * Loads OpenCV's JavaScript build (`@techstark/opencv-js`, WebAssembly, runs offline from its npm
 * package) once per process, and names the small part of it marker following uses.
 */
import { createRequire } from 'node:module';

/** An OpenCV matrix (only what marker following touches). */
export interface CvMat {
  rows: number;
  cols: number;
  data: Uint8Array;
  data32F: Float32Array;
  delete(): void;
}

/** The OpenCV functions and constants marker following uses. */
export interface OpenCv {
  Mat: new (rows?: number, cols?: number, type?: number) => CvMat;
  Size: new (width: number, height: number) => unknown;
  TermCriteria: new (type: number, maxCount: number, epsilon: number) => unknown;
  CV_8UC1: number;
  CV_32FC2: number;
  TermCriteria_EPS: number;
  TermCriteria_COUNT: number;
  OPTFLOW_USE_INITIAL_FLOW: number;
  TM_CCOEFF_NORMED: number;
  calcOpticalFlowPyrLK(
    prev: CvMat,
    next: CvMat,
    prevPts: CvMat,
    nextPts: CvMat,
    status: CvMat,
    err: CvMat,
    winSize: unknown,
    maxLevel: number,
    criteria: unknown,
    flags?: number,
  ): void;
  matchTemplate(image: CvMat, templ: CvMat, result: CvMat, method: number): void;
}

let loading: Promise<{ cv: OpenCv }> | null = null;

/**
 * OpenCV, initialised once (about a second the first time; then shared). The module object is a
 * "thenable" (its `then` hands back the module itself, so awaiting it never ends): it is passed
 * inside a wrapper and its `then` is removed once it is ready.
 */
export async function loadOpenCv(): Promise<OpenCv> {
  loading ??= new Promise<{ cv: OpenCv }>((resolve, reject) => {
    try {
      const require = createRequire(import.meta.url);
      const mod = require('@techstark/opencv-js') as OpenCv & { onRuntimeInitialized?: () => void };
      const ready = () => {
        delete (mod as { then?: unknown }).then;
        resolve({ cv: mod });
      };
      if (typeof (mod as { calcOpticalFlowPyrLK?: unknown }).calcOpticalFlowPyrLK === 'function') ready();
      else mod.onRuntimeInitialized = ready;
    } catch (err) {
      reject(err instanceof Error ? err : new Error(String(err)));
    }
  });
  return (await loading).cv;
}
