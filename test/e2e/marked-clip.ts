import type { Client } from '../support/test-app';
import { generateRunnerClip } from '../../scripts/demo-clip/clip';
import { marksFromTruth } from '../../scripts/demo-clip/demo-marks';

/**
 * Renders a 2 s synthetic runner clip (scripts/demo-clip; known hip extension at toe-off), uploads
 * it to the assessment through the API, waits until its frames are ready, and marks every frame
 * from the generator's ground truth as a coach would. Returns the clip id.
 */
export async function uploadMarkedClip(api: Client, assessmentId: number, file: string, hipExtensionDeg: number): Promise<number> {
  const truth = await generateRunnerClip({ fps: 60, width: 640, height: 360, seconds: 2, hipExtensionDeg, facing: 'right', beltSpeedMps: 3, outFile: file, preset: 'ultrafast' });
  const up = await api.agent.post(`/api/assessments/${assessmentId}/clips`).set('X-XSRF-TOKEN', await api.xsrf()).attach('file', file);
  const clipId = up.body.id as number;
  for (let i = 0; ; i++) {
    const clip = (await api.get(`/api/clips/${clipId}`)).body;
    if (clip.status === 'ready') break;
    if (clip.status === 'failed' || i > 300) throw new Error(`clip ${clip.status}: ${clip.error}`);
    await new Promise((r) => setTimeout(r, 200));
  }
  await api.patch(`/api/clips/${clipId}`, { nearSide: truth.nearSide, direction: 'left_to_right' });
  const res = await api.put(`/api/clips/${clipId}/annotations`, marksFromTruth(truth, 'all'));
  if (res.status !== 200) throw new Error(`annotations: ${res.status} ${JSON.stringify(res.body).slice(0, 300)}`);
  return clipId;
}
