/**
 * Where the review canvas sits on the screen's pixels, and the one mapping between a pointer's
 * client position and the frame. Pure functions.
 *
 * A browser shows a canvas's backing store stretched over the canvas box after snapping that box
 * to whole pixels: physical (device) pixels on a real high-density screen, whole CSS pixels under
 * device emulation. A box that starts half-way through a pixel (at 150 % a whole CSS pixel may
 * be x.5 device pixels) or whose size is not a whole number of device pixels is moved or
 * stretched by up to half a pixel, while pointer positions keep the unsnapped layout: marks
 * landed about a third of a CSS pixel (≈ 1 frame pixel on a phone) away from the press. So the
 * canvas box is placed on a grid that is whole in both CSS and device pixels
 * (`pixelGridStep`), inside its host, and its backing store is exactly box × ratio: then every
 * snapping is a no-op, one backing pixel is one device pixel, and the box's own left/top are
 * where the picture is.
 */
import { Size, Vec, ViewTransform, frameToScreen, screenToFrame } from './view-transform';

/** A box in client (viewport) CSS pixels, as `getBoundingClientBox` gives it. */
export interface ClientBox {
  left: number;
  top: number;
  width: number;
  height: number;
}

/** Where the canvas goes in its host and how large its backing store is. */
export interface CanvasPlacement {
  /** Offset of the canvas box from the host's top-left corner, CSS px (0 ≤ offset < step). */
  offset: Vec;
  /** The canvas box, CSS px (a whole number of grid steps). */
  size: Size;
  /** The backing store, device px: exactly `size × ratio`. */
  backing: Size;
  /** Device pixels per CSS pixel the placement was made for. */
  ratio: number;
}

/** Largest grid step tried (CSS px); ratios needing more fall back to whole device pixels only. */
const MAX_STEP = 8;
/** How close to a whole number counts as whole (CSS lengths are kept in 1/64 px). */
const WHOLE = 1 / 128;

function isWhole(v: number): boolean {
  return Math.abs(v - Math.round(v)) < WHOLE;
}

/**
 * The smallest whole number of CSS pixels that is also a whole number of device pixels at
 * `ratio` (1 at 1, 2 and 3; 2 at 1.5; 4 at 1.25 and 1.75); 0 when none up to 8 is (the box is
 * then put on whole device pixels only).
 */
export function pixelGridStep(ratio: number): number {
  for (let n = 1; n <= MAX_STEP; n++) if (isWhole(n * ratio)) return n;
  return 0;
}

/** The device pixel ratio as the browser reports it (1 where it reports none). */
export function deviceRatio(reported: number | undefined): number {
  return reported && Number.isFinite(reported) && reported > 0 ? reported : 1;
}

/**
 * The canvas box inside a host at `host` (client CSS px): the largest box on the grid of
 * `pixelGridStep(ratio)` that fits inside the host, and its backing store.
 */
export function placeCanvas(host: ClientBox, ratio: number): CanvasPlacement {
  const step = pixelGridStep(ratio);
  // On the common grid when there is one, else on whole device pixels (units of 1 / ratio CSS px).
  const unit = step || 1 / ratio;
  const snapUp = (v: number) => Math.ceil((v - WHOLE) / unit) * unit;
  const snapDown = (v: number) => Math.floor((v + WHOLE) / unit) * unit;
  const left = snapUp(host.left);
  const top = snapUp(host.top);
  const width = Math.max(0, snapDown(host.left + host.width) - left);
  const height = Math.max(0, snapDown(host.top + host.height) - top);
  return {
    offset: { x: left - host.left + 0, y: top - host.top + 0 }, // + 0: never −0
    size: { width, height },
    backing: { width: Math.round(width * ratio), height: Math.round(height * ratio) },
    ratio,
  };
}

/** Whether a canvas box at `box` (client CSS px) sits on whole device pixels at `ratio`. */
export function isOnDevicePixels(box: ClientBox, ratio: number): boolean {
  return isWhole(box.left * ratio) && isWhole(box.top * ratio) && isWhole(box.width * ratio) && isWhole(box.height * ratio);
}

/**
 * The canvas box's top-left corner as the screen shows it: the layout's position rounded to the
 * device pixel it was placed on (CSS lengths are kept in 1/64 px, so a placed box reads back a
 * hair off its pixel).
 */
export function canvasOrigin(box: ClientBox, ratio: number): Vec {
  return { x: Math.round(box.left * ratio) / ratio, y: Math.round(box.top * ratio) / ratio };
}

/** A pointer's client position → canvas CSS px (the view transform's screen space). */
export function clientToView(origin: Vec, client: Vec): Vec {
  return { x: client.x - origin.x, y: client.y - origin.y };
}

/** Canvas CSS px → client position. */
export function viewToClient(origin: Vec, p: Vec): Vec {
  return { x: p.x + origin.x, y: p.y + origin.y };
}

/** A pointer's client position → frame pixels. */
export function clientToFrame(t: ViewTransform, origin: Vec, client: Vec): Vec {
  return screenToFrame(t, clientToView(origin, client));
}

/** Frame pixels → client position. */
export function frameToClient(t: ViewTransform, origin: Vec, p: Vec): Vec {
  return viewToClient(origin, frameToScreen(t, p));
}

/** Frame pixels → backing-store (device) pixels: what the painter draws with. */
export function frameToBacking(t: ViewTransform, ratio: number, p: Vec): Vec {
  const s = frameToScreen(t, p);
  return { x: s.x * ratio, y: s.y * ratio };
}
