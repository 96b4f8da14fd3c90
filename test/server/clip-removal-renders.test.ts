/**
 * Removing a clip ends the renders about it: stills and annotated clips drawn from its frames, and a
 * still pairing another clip with it. Before, only the clip's own items (frames, marker following)
 * were cancelled; a render queued from the clip stayed queued (to fail later, taking a worker slot)
 * and a pair still showed "rendering" for good.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, signedIn, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { makeClip, tempDir } from './media/fixtures';
import { uploadClip } from '../support/bodies';
import type { Still } from '../../src/contracts/sharing';
import { renderStillKind } from '../../server/stills/render-still-kind';
import type { MediaStore } from '../../server/storage/media-store';
import type { ProcessedItem } from '../../server/processing/processed-item';
import pino from 'pino';

const [owner, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let c: Client;
let dir: { dir: string; cleanup: () => Promise<void> };
let adaId: number;
let baselineClip: number;
let retestClip: number;
let spareClip: number;

async function upload(assessmentId: number, file: string): Promise<number> {
  const res = await uploadClip(c, assessmentId, file);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.id as number;
}

const itemStates = (subject: string, id: number) =>
  t.db('processed_items').where({ subject_type: subject, subject_id: id }).pluck('state') as Promise<string[]>;

beforeAll(async () => {
  dir = await tempDir('clip-removal-renders');
  t = await makeTestApp();
  c = await signedIn(t.app, coach.email, coach.password);
  adaId = (await t.db('athletes').where({ email: athlete.email }).first()).id;
  const baselineId = (await t.db('assessments').where({ athlete_id: adaId, kind: 'baseline' }).first()).id;
  const retestId = (await t.db('assessments').where({ athlete_id: adaId, kind: 'retest' }).first()).id;
  const file = await makeClip(path.join(dir.dir, 'walk.mp4'), { fps: 30, width: 160, height: 90, seconds: 1 });
  baselineClip = await upload(baselineId, file);
  retestClip = await upload(retestId, file);
  spareClip = await upload(retestId, file);
  await t.worker!.idle();
  // Renders asked for from here stay queued, as behind a busy worker.
  await t.worker!.stop();
}, 60_000);

afterAll(async () => {
  await t?.close();
  await dir?.cleanup();
});

describe('removing a clip while renders about it wait', () => {
  it('cancels its stills, its annotated clips and the pair stills that show it; they answer failed or 404, nothing is left to run', async () => {
    const still = await c.post(`/api/clips/${retestClip}/stills`, { frameIndex: 0, caption: '', showAngles: false });
    expect(still.status, JSON.stringify(still.body)).toBe(202);
    // A pair still kept under the Baseline clip's folder, showing a frame of the clip removed below.
    const pair = await c.post(`/api/clips/${baselineClip}/stills`, {
      frameIndex: 0,
      caption: '',
      showAngles: false,
      pairWith: { clipId: retestClip, frameIndex: 1 },
    });
    expect(pair.status, JSON.stringify(pair.body)).toBe(202);
    const video = await c.post(`/api/clips/${retestClip}/annotated-clips`, { fromFrame: 0, toFrame: 9, factor: 1, caption: '' });
    expect(video.status, JSON.stringify(video.body)).toBe(202);
    expect(await itemStates('still', still.body.id)).toEqual(['queued']);

    const events: { subject: string; id: number; state: string }[] = [];
    const stop = t.processing.channel.subscribe(adaId, (n) => events.push(n.event));
    expect((await c.delete(`/api/clips/${retestClip}`)).status).toBe(204);
    stop();

    expect(await itemStates('still', still.body.id)).toEqual(['cancelled']);
    expect(await itemStates('still', pair.body.id)).toEqual(['cancelled']);
    expect(await itemStates('annotated_clip', video.body.id)).toEqual(['cancelled']);
    expect(events).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ subject: 'still', id: pair.body.id, state: 'cancelled' }),
        expect.objectContaining({ subject: 'annotated_clip', id: video.body.id, state: 'cancelled' }),
      ]),
    );
    // Nothing about the removed clip is left for a worker to claim.
    expect(await t.processing.queue.claim()).toBeNull();

    // A page polling them gets a clear answer, never "rendering" for good nor a 5xx.
    const single = (await c.get(`/api/stills/${still.body.id}`)).body as Still;
    expect(single).toMatchObject({ status: 'failed' });
    expect(single.error).toContain('deleted');
    const paired = await c.get(`/api/stills/${pair.body.id}`);
    expect(paired.status).toBe(200);
    expect(paired.body).toMatchObject({ status: 'failed' });
    expect((paired.body as Still).error).toContain('deleted');
    expect((await c.agent.get(`/api/stills/${pair.body.id}/image.png`)).status).toBe(404);
    expect((await c.get(`/api/annotated-clips/${video.body.id}`)).status).toBe(404);
    expect(await t.store.list(`clips/${retestClip}/`)).toEqual([]);
  });
});

describe('removing a clip while its still is being drawn elsewhere', () => {
  it('leaves no images: the render finding its clip gone removes what it stored and records nothing', async () => {
    const res = await c.post(`/api/clips/${spareClip}/stills`, { frameIndex: 0, caption: '', showAngles: false });
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    // A worker in another process: its first image is stored just as the clip is removed here
    // (before its next heartbeat could tell it that its item was cancelled).
    let removed = false;
    const store = new Proxy(t.store, {
      get(target, name, receiver) {
        if (name !== 'put') return Reflect.get(target, name, receiver) as unknown;
        return async (key: string, body: Buffer) => {
          await target.put(key, body);
          if (!removed) {
            removed = true;
            expect((await c.delete(`/api/clips/${spareClip}`)).status).toBe(204);
          }
        };
      },
    }) as MediaStore;
    const kind = renderStillKind({ db: t.db, store });
    const item = { id: 0, kind: kind.name, subjectType: 'still', subjectId: res.body.id as number } as ProcessedItem;
    const out = await kind.run(item, {
      signal: new AbortController().signal,
      progress: () => undefined,
      threads: 1,
      logger: pino({ level: 'silent' }),
    });
    expect(removed).toBe(true);
    expect(out).toBeNull();
    expect(await t.store.list(`clips/${spareClip}/`)).toEqual([]);
    expect((await c.get(`/api/stills/${res.body.id}`)).body).toMatchObject({ status: 'failed' });
  });
});

describe('erasing the athlete while renders about their clips wait', () => {
  it('cancels them too: nothing is left to run, their rows and files are gone (404)', async () => {
    const still = await c.post(`/api/clips/${baselineClip}/stills`, { frameIndex: 2, caption: 'before erasure', showAngles: false });
    expect(still.status, JSON.stringify(still.body)).toBe(202);
    const video = await c.post(`/api/clips/${baselineClip}/annotated-clips`, { fromFrame: 0, toFrame: 5, factor: 1, caption: '' });
    expect(video.status, JSON.stringify(video.body)).toBe(202);
    const o = await signedIn(t.app, owner.email, owner.password);
    const ada = await t.db('athletes').where({ id: adaId }).first();
    const erased = await o.post(`/api/athletes/${adaId}/erasure`, { confirmName: `${ada.first_name} ${ada.last_name}` });
    expect(erased.status, JSON.stringify(erased.body)).toBe(200);
    expect(await t.db('processed_items').whereIn('state', ['queued', 'running']).pluck('id')).toEqual([]);
    expect(await t.processing.queue.claim()).toBeNull();
    expect((await c.get(`/api/stills/${still.body.id}`)).status).toBe(404);
    expect((await c.get(`/api/annotated-clips/${video.body.id}`)).status).toBe(404);
    expect(await t.store.list(`clips/${baselineClip}/`)).toEqual([]);
  });
});
