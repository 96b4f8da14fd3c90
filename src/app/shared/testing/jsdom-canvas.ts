/**
 * For component specs under jsdom, which has no layout observer, no 2D canvas context and no
 * image decoding: installs stand-ins (a silent ResizeObserver where none exists, `getContext`
 * answering null so painters draw nothing, a `createImageBitmap` answering a blank bitmap) and
 * answers a function that puts the originals back. Use in `beforeAll` / `afterAll`.
 */
export function stubJsdomCanvas(): () => void {
  const realGetContext = HTMLCanvasElement.prototype.getContext;
  const realResizeObserver = globalThis.ResizeObserver;
  const realBitmap = globalThis.createImageBitmap;
  globalThis.ResizeObserver ??= class {
    observe(): void {}
    unobserve(): void {}
    disconnect(): void {}
  } as unknown as typeof ResizeObserver;
  HTMLCanvasElement.prototype.getContext = (() => null) as never;
  globalThis.createImageBitmap = (async () => ({ width: 1, height: 1, close() {} })) as never;
  return () => {
    HTMLCanvasElement.prototype.getContext = realGetContext;
    globalThis.ResizeObserver = realResizeObserver;
    globalThis.createImageBitmap = realBitmap;
  };
}
