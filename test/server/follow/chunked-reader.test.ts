/** The chunked frame reader decodes each frame about once, following forward and then backward. */
import { describe, expect, it } from 'vitest';
import { chunkedFrameReader } from '../../../server/follow/gray-decode';
import type { GrayFrame } from '../../../server/follow/gray-frame';

describe('chunkedFrameReader', () => {
  it('reads every frame forward then backward with ⌈n / chunk⌉ decodes each way, and the right frame each time', async () => {
    const calls: Array<[number, number]> = [];
    const reader = chunkedFrameReader(
      { frameCount: 100, width: 1, height: 1 },
      async (first, count) => {
        calls.push([first, count]);
        return Array.from({ length: count }, (_, i): GrayFrame => ({ width: 1, height: 1, data: Uint8Array.of(first + i) }));
      },
      48,
    );
    for (let f = 50; f < 100; f++) expect((await reader.read(f)).data[0]).toBe(f);
    const forward = calls.length;
    for (let f = 49; f >= 0; f--) expect((await reader.read(f)).data[0]).toBe(f);
    expect(forward).toBe(2); // [50, 98) and [98, 100)
    expect(calls.length - forward).toBe(2); // each backward chunk ends at the frame asked for (the start of the clip clamps it)
    expect(calls.slice(forward)).toEqual([
      [2, 48],
      [0, 48],
    ]);
  });
});
