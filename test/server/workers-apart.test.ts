/**
 * Workers apart: one web server (no worker of its own) and two worker processes (`npm run worker`)
 * over the same database and uploads folder. Three clips are uploaded; one worker is killed with
 * SIGKILL (with its ffmpeg) in the middle of an extraction. Every clip ends ready with every
 * frame, as counted by ffprobe -count_frames (outside reference); the killed worker's item is
 * taken over by the other once its lease ran out; and progress made in the worker processes
 * reaches the athlete's progress stream through the web server.
 */
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ffprobeCounted } from './media/fixtures';
import {
  coachFollowing,
  killMidExtraction,
  processesApart,
  sawClipToReady,
  threeClips,
  uploadClips,
  waitClipsReady,
  type ItemRow,
  type ProcessesApart,
} from '../support/processes-flow';

let run: ProcessesApart | undefined;

beforeAll(async () => {
  run = await processesApart('workers-apart');
});
afterAll(async () => {
  await run?.stop();
});

describe('one web server and two worker processes', () => {
  it('every clip ends ready with every frame after a worker is killed mid-extraction', async () => {
    const { dir } = run!;
    const files = await threeClips(dir);
    const db = await run!.start(1);
    const [server] = run!.servers;
    const { client: c, athleteId, stream } = await coachFollowing(server!.url);
    const clipIds = await uploadClips(c, athleteId, files);

    // Kill the first worker once it has written frames of a clip.
    const victim = run!.workers[0]!;
    const tag = `:${victim.pid}:`;
    const killed = await killMidExtraction(db, victim);

    const ready = await waitClipsReady(c, clipIds);
    for (const [i, id] of clipIds.entries()) {
      const ref = await ffprobeCounted(files[i]!);
      expect(ready.get(id)!.frameCount).toBe(ref.nbReadFrames);
      const frames = fs.readdirSync(path.join(dir, 'uploads', 'clips', String(id), 'frames'));
      expect(frames).toHaveLength(ref.nbReadFrames);
    }
    // The killed attempt's item was taken over by the other worker: another attempt, not a new item.
    const takenOver = (await db('processed_items').where({ id: killed.id }).first()) as ItemRow;
    expect(takenOver.state).toBe('ready');
    expect(takenOver.attempts).toBeGreaterThanOrEqual(2);
    expect(takenOver.claimed_by).not.toContain(tag);
    const items = await db('processed_items').where({ kind: 'extract_frames' }).whereIn('subject_id', clipIds);
    expect(items).toHaveLength(clipIds.length);

    // Progress made in the worker processes reached the athlete's stream through the web server.
    for (const id of clipIds) expect(await sawClipToReady(stream, id)).toBe(true);
    stream.close();
  }, 420_000);
});
