/**
 * The owners' e-mail when an athlete withdraws consent to video (`server/mail/video-consent-notice.ts`),
 * sent the real way: nodemailer over SMTP to the demo's local receiver, read back from its mailbox.
 * Every active owner of the athlete's clinic gets one message saying uploads are stopped and asking
 * whether to erase the clips held, with a link to the athlete's Data tab; nobody else gets it, and
 * giving consent (or saving the intake again unchanged) sends nothing.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import path from 'node:path';
import { makeClip, tempDir } from '../media/fixtures';
import { hashPassword } from '../../../server/auth/passwords';
import { intakeWith, uploadToNewVisit } from '../../support/bodies';
import { Client, makeTestApp, OTHER, signedIn, type TestApp } from '../../support/test-app';
import { DEMO_CLINIC_NAME, DEMO_SIGN_INS } from '../../../seeds/demo-scenario';

const [ownerCred, coachCred, , athleteCred] = DEMO_SIGN_INS;

const intake = (videoRecording: boolean) => intakeWith({ videoRecording, shareStills: true });

let t: TestApp;
let athlete: Client;
let coach: Client;
let adaId: number;
let dir: { dir: string; cleanup: () => Promise<void> };
const secondOwner = 'second.owner@clinic.test';
const formerOwner = 'former.owner@clinic.test';

/** What the SMTP receiver stored, oldest first. */
const mailbox = () =>
  t.db('mailbox_messages').orderBy('id').select<{ to_address: string; subject: string; text: string }[]>('to_address', 'subject', 'text');

beforeAll(async () => {
  t = await makeTestApp();
  athlete = await signedIn(t.app, athleteCred.email, athleteCred.password);
  coach = await signedIn(t.app, coachCred.email, coachCred.password);
  const ada = await t.db('athletes').where({ email: athleteCred.email }).first<{ id: number; clinic_id: number }>();
  adaId = ada!.id;
  const at = new Date().toISOString();
  const passwordHash = await hashPassword('another-owner-pass-1');
  for (const [email, active] of [
    [secondOwner, true],
    [formerOwner, false],
  ] as const)
    await t.db('users').insert({
      clinic_id: ada!.clinic_id,
      email,
      name: email === secondOwner ? 'Second Owner' : 'Former Owner',
      role: 'owner',
      active,
      password_hash: passwordHash,
      created_at: at,
      updated_at: at,
    });
  // Consent to video given, so that withdrawing it is a change; one clip held (a real upload).
  expect((await coach.put(`/api/athletes/${adaId}/intake`, intake(true))).status).toBe(200);
  dir = await tempDir('consent-notice');
  const clipFile = await makeClip(path.join(dir.dir, 'run.mp4'), { fps: 30, width: 160, height: 90, seconds: 1 });
  await uploadToNewVisit(coach, adaId, clipFile);
  await t.db('mailbox_messages').delete();
}, 60_000);

afterAll(async () => {
  await t?.close();
  await dir?.cleanup();
});

describe('video consent withdrawn: the owners are asked about the clips', () => {
  it('each active owner of the clinic gets one e-mail (uploads stopped, erase the clips?, link to the Data tab); no one else', async () => {
    expect((await athlete.put(`/api/athletes/${adaId}/intake`, intake(false))).status).toBe(200);
    const mail = await mailbox();
    expect(mail.map((m) => m.to_address).sort()).toEqual([ownerCred.email, secondOwner].sort());
    expect(mail.map((m) => m.to_address)).not.toContain(formerOwner);
    expect(mail.map((m) => m.to_address)).not.toContain(coachCred.email);
    expect(mail.map((m) => m.to_address)).not.toContain(OTHER.owner.email);
    for (const m of mail) {
      expect(m.subject).toBe('Ada Kestrel withdrew consent to video');
      expect(m.text).toContain(`Ada Kestrel has withdrawn their consent to video recording at ${DEMO_CLINIC_NAME}.`);
      expect(m.text).toContain('Uploads of new clips for them are stopped.');
      expect(m.text).toContain('One clip of theirs is still held. Should they be erased? The clips stay until you decide');
      expect(m.text).toContain(`Decide on the athlete's Data tab: ${t.config.publicUrl}/athletes/${adaId}?tab=data`);
      // On the clinic's letterhead, like its other mail: the footer names the clinic.
      expect(m.text).toContain(DEMO_CLINIC_NAME);
    }
    const owner = mail.find((m) => m.to_address === secondOwner)!;
    expect(owner.text).toMatch(/^Hello Second Owner,/);
  });

  it('saving the intake again without a change, or giving consent back, sends nothing; uploads are refused meanwhile', async () => {
    await t.db('mailbox_messages').delete();
    expect((await athlete.put(`/api/athletes/${adaId}/intake`, intake(false))).status).toBe(200);
    const assessment = await t.db('assessments').where({ athlete_id: adaId }).first<{ id: number }>();
    const refused = await coach.agent
      .post(`/api/assessments/${assessment!.id}/clips`)
      .set('X-XSRF-TOKEN', await coach.xsrf())
      .attach('file', Buffer.from('not sent'), 'run.mp4');
    expect(refused.status).toBe(409);
    expect((await coach.put(`/api/athletes/${adaId}/intake`, intake(true))).status).toBe(200);
    expect(await mailbox()).toEqual([]);
  });
});
