import type { Knex } from 'knex';
import fs from 'node:fs';
import path from 'node:path';
import { hashPassword } from '../server/auth/passwords';
import { localMediaStore } from '../server/storage/local-media-store';
import { clipKeys } from '../server/storage/media-keys';
import { uploadTempDir } from '../server/storage/upload-temps';
import { processedItemsRepository } from '../server/processing/processed-items-repository';
import type { AssessmentKind } from '../src/contracts/assessment';
import { EXTRACT_FRAMES } from '../server/clips/extract-frames-kind';
import { generateDemoClips } from '../scripts/demo-clip/clip';
import { demoMarks } from '../scripts/demo-clip/demo-marks';
import type { GroundTruth } from '../scripts/demo-clip/ground-truth';
import { freezePanel } from '../server/stills/stills-service';
import { RENDER_STILL } from '../server/stills/render-still-kind';
import { RENDER_SUMMARY } from '../server/summaries/render-summary-kind';
import { annotationsRepository } from '../server/annotations/annotations-repository';
import { seedDemoHamstringPlan, seedDemoPlans } from './demo-plans';
import { seedDemoPictures } from './demo-illustrations/seed-pictures';
import { seedDemoInvoices } from './demo-invoices';
import { seedDemoPrices } from './demo-prices';

/**
 * The demo scenario: an invented clinic, its staff and athletes. Every person, place and e-mail
 * here is made up (e-mails use the reserved `.test` domain). Used by `npm start` and the tests.
 */
export const DEMO_SIGN_INS = [
  { role: 'owner', name: 'Mira Castellan', email: 'owner@larchwood-clinic.test', password: 'larchwood-owner-1' },
  { role: 'coach', name: 'Tobin Achterberg', email: 'tobin@larchwood-clinic.test', password: 'larchwood-coach-1' },
  { role: 'coach', name: 'Ilse Varnum', email: 'ilse@larchwood-clinic.test', password: 'larchwood-coach-2' },
  { role: 'athlete', name: 'Ada Kestrel', email: 'ada.kestrel@runner.test', password: 'larchwood-athlete-1' },
] as const;

export const DEMO_CLINIC_NAME = 'Larchwood Running Clinic';

interface DemoAthlete {
  first: string;
  last: string;
  email: string | null;
  dob: string | null;
  coach: 1 | 2;
  heightCm: number | null;
  unit: 'km' | 'mi';
  weeklyKm: number | null;
  longestKm: number | null;
  goalEvent: string | null;
  goalDate: string | null;
  surfaces: string[];
  notes: string | null;
  injuries: { region: string; side: string; began: string; status: string; notes: string }[];
  pain: { region: string; score: number }[];
  consents: { video: boolean; stills: boolean } | null;
  hasAccount: boolean;
}

const ATHLETES: DemoAthlete[] = [
  {
    first: 'Ada',
    last: 'Kestrel',
    email: 'ada.kestrel@runner.test',
    dob: '1996-02-19',
    coach: 1,
    heightCm: 166,
    unit: 'km',
    weeklyKm: 55,
    longestKm: 28,
    goalEvent: 'Quillmoor Ridge 42 km trail race',
    goalDate: '2027-06-05',
    surfaces: ['trail', 'track'],
    notes:
      'Strained her right hamstring in a sprint finish in August. Easy running is comfortable again, but her push-off looks guarded. Check hip extension at toe-off.',
    injuries: [
      {
        region: 'hamstring',
        side: 'right',
        began: '2026-08',
        status: 'recovering',
        notes: 'Outer hamstring strain in the downhill sprint finish of the Orrinsby Gorge 25 km; graded by her sports doctor',
      },
      {
        region: 'shin',
        side: 'both',
        began: '2021-03',
        status: 'resolved',
        notes: 'Shin pain after doubling her weekly distance; settled with a slower build',
      },
    ],
    pain: [{ region: 'hamstring', score: 4 }],
    consents: { video: true, stills: true },
    hasAccount: true,
  },
  {
    first: 'Teodor',
    last: 'Brannick',
    email: 'teodor.brannick@runner.test',
    dob: '1984-05-27',
    coach: 1,
    heightCm: 183,
    unit: 'mi',
    weeklyKm: 64.4,
    longestKm: 35.4,
    goalEvent: 'Fenwhistle Hills 50 km',
    goalDate: '2027-09-18',
    surfaces: ['road', 'trail'],
    notes: 'Road runner moving to trails. Aching front of the right knee on long descents; lands with the foot well ahead of the body.',
    injuries: [
      {
        region: 'knee',
        side: 'right',
        began: '2026-06',
        status: 'active',
        notes: 'Front-of-knee ache after half an hour of downhill; stairs down hurt the next day',
      },
    ],
    pain: [{ region: 'knee', score: 3 }],
    consents: { video: true, stills: false },
    hasAccount: false,
  },
  {
    first: 'Carys',
    last: 'Holmgren',
    email: 'carys.holmgren@runner.test',
    dob: '1994-06-21',
    coach: 2,
    heightCm: 163,
    unit: 'km',
    weeklyKm: 30,
    longestKm: 12,
    goalEvent: 'Tarnwick Harbour 10 km',
    goalDate: '2027-03-14',
    surfaces: ['road', 'treadmill'],
    notes:
      'Achilles pain since she raised her weekly distance in the autumn; stiff for the first steps each morning. Building back with run-walk.',
    injuries: [
      {
        region: 'achilles',
        side: 'right',
        began: '2026-09',
        status: 'active',
        notes: 'Mid-portion pain and thickening, worse after hill sessions',
      },
    ],
    pain: [{ region: 'achilles', score: 2 }],
    consents: { video: true, stills: true },
    hasAccount: false,
  },
  {
    first: 'Dario',
    last: 'Vence',
    email: 'dario.vence@runner.test',
    dob: '2005-01-30',
    coach: 2,
    heightCm: 176,
    unit: 'km',
    weeklyKm: 60,
    longestKm: 18,
    goalEvent: '1500 m track season',
    goalDate: '2027-05-22',
    surfaces: ['track', 'grass'],
    notes: null,
    injuries: [],
    pain: [],
    consents: { video: true, stills: true },
    hasAccount: false,
  },
  {
    first: 'Efa',
    last: 'Lindqvist',
    email: 'efa.lindqvist@runner.test',
    dob: '1979-09-08',
    coach: 1,
    heightCm: 171,
    unit: 'km',
    weeklyKm: 45,
    longestKm: 21,
    goalEvent: 'Half marathon',
    goalDate: null,
    surfaces: ['treadmill', 'road'],
    notes: null,
    injuries: [
      {
        region: 'heel',
        side: 'left',
        began: '2023-03',
        status: 'resolved',
        notes: 'Plantar heel pain, settled with calf and foot strengthening',
      },
    ],
    pain: [],
    consents: null,
    hasAccount: false,
  },
  {
    first: 'Farid',
    last: 'Osterman',
    email: null,
    dob: null,
    coach: 2,
    heightCm: null,
    unit: 'km',
    weeklyKm: null,
    longestKm: null,
    goalEvent: null,
    goalDate: null,
    surfaces: [],
    notes: 'New runner, first visit booked.',
    injuries: [],
    pain: [],
    consents: null,
    hasAccount: false,
  },
];

interface DemoAssessment {
  athlete: string;
  date: string;
  kind: 'baseline' | 'retest';
  surface: 'treadmill' | 'road' | 'trail' | 'track';
  speedKmh: number | null;
  inclinePercent: number | null;
  shoes: string;
  cameraNotes: string;
  notes: string;
}

const ASSESSMENTS: DemoAssessment[] = [
  {
    athlete: 'Kestrel',
    date: '2026-10-06',
    kind: 'baseline',
    surface: 'treadmill',
    speedKmh: 10.8,
    inclinePercent: 1,
    shoes: 'Trail shoe, 6 mm drop',
    cameraNotes: 'Phone on tripod, 3 m from belt, hip height, 120 fps',
    notes:
      'Seven weeks after the strain. Guarded push-off: the thigh hardly passes vertical at toe-off, and the foot lands well ahead of the hip.',
  },
  {
    athlete: 'Kestrel',
    date: '2026-11-24',
    kind: 'retest',
    surface: 'treadmill',
    speedKmh: 10.8,
    inclinePercent: 1,
    shoes: 'Trail shoe, 6 mm drop',
    cameraNotes: 'Same set-up as baseline (tape marks on the floor)',
    notes: 'After seven weeks of staged hamstring loading: holds and easy agility, then lengthening work.',
  },
  {
    athlete: 'Brannick',
    date: '2026-11-17',
    kind: 'baseline',
    surface: 'treadmill',
    speedKmh: 11.5,
    inclinePercent: 0,
    shoes: 'Road trainer, 10 mm drop',
    cameraNotes: 'Tripod, 4 m, 240 fps slow motion',
    notes: 'Knee ache after long descents. Check knee flexion and heel position at initial contact, and step rate.',
  },
];

/** Options of {@link seed}. */
export interface SeedOptions {
  /** Where media lives; when set, the demo clips are generated and queued for processing. */
  uploadsDir?: string;
  log?: (message: string) => void;
}

/** Inserts the demo scenario unless a clinic already exists. Returns whether it seeded. */
export async function seed(knex: Knex, opts: SeedOptions = {}): Promise<boolean> {
  const existing = await knex('clinics').first('id');
  if (existing) return false;
  const at = new Date().toISOString();
  const hashes = await Promise.all(DEMO_SIGN_INS.map((s) => hashPassword(s.password)));
  await knex.transaction(async (trx) => {
    const [clinic] = await trx('clinics')
      .insert({ name: DEMO_CLINIC_NAME, currency: 'EUR', distance_unit: 'km', created_at: at })
      .returning('id');
    const clinicId = (clinic as { id: number }).id;
    const userIds: number[] = [];
    for (const [i, s] of DEMO_SIGN_INS.entries()) {
      const [u] = await trx('users')
        .insert({
          clinic_id: clinicId,
          email: s.email,
          name: s.name,
          role: s.role,
          password_hash: hashes[i],
          active: true,
          created_at: at,
          updated_at: at,
        })
        .returning('id');
      userIds.push((u as { id: number }).id);
    }
    const athleteUserId = userIds[3];
    for (const a of ATHLETES) {
      const [row] = await trx('athletes')
        .insert({
          clinic_id: clinicId,
          user_id: a.hasAccount ? athleteUserId : null,
          coach_id: userIds[a.coach],
          first_name: a.first,
          last_name: a.last,
          email: a.email,
          date_of_birth: a.dob,
          height_cm: a.heightCm,
          distance_unit: a.unit,
          weekly_km: a.weeklyKm,
          longest_run_km: a.longestKm,
          goal_event: a.goalEvent,
          goal_date: a.goalDate,
          surfaces: JSON.stringify(a.surfaces),
          notes: a.notes,
          created_at: at,
          updated_at: at,
        })
        .returning('id');
      const athleteId = (row as { id: number }).id;
      if (a.injuries.length) {
        await trx('injuries').insert(a.injuries.map((inj, position) => ({ clinic_id: clinicId, athlete_id: athleteId, ...inj, position })));
      }
      if (a.pain.length) {
        await trx('pain_entries').insert(
          a.pain.map((p) => ({
            clinic_id: clinicId,
            athlete_id: athleteId,
            region: p.region,
            score: p.score,
            current: true,
            source: 'intake',
            recorded_by: userIds[a.coach],
            recorded_at: at,
          })),
        );
      }
      if (a.consents) {
        await trx('consents').insert([
          {
            clinic_id: clinicId,
            athlete_id: athleteId,
            kind: 'video_recording',
            granted: a.consents.video,
            recorded_by: userIds[a.coach],
            recorded_at: at,
          },
          {
            clinic_id: clinicId,
            athlete_id: athleteId,
            kind: 'share_stills',
            granted: a.consents.stills,
            recorded_by: userIds[a.coach],
            recorded_at: at,
          },
        ]);
      }
      await trx('audit_log').insert({
        clinic_id: clinicId,
        actor_id: userIds[a.coach],
        athlete_id: athleteId,
        action: 'athlete.created',
        detail: JSON.stringify({ seed: true }),
        at,
      });
      for (const s of ASSESSMENTS.filter((x) => x.athlete === a.last)) {
        await trx('assessments').insert({
          clinic_id: clinicId,
          athlete_id: athleteId,
          date: s.date,
          kind: s.kind,
          surface: s.surface,
          speed_mps: s.speedKmh === null ? null : s.speedKmh / 3.6,
          speed_unit: 'kmh',
          incline_percent: s.inclinePercent,
          shoes: s.shoes,
          camera_notes: s.cameraNotes,
          notes: s.notes,
          created_by: userIds[a.coach],
          created_at: at,
          updated_at: at,
        });
      }
    }
    await seedDemoPlans(trx, clinicId, userIds[1]!);
    await seedDemoPrices(trx, clinicId, at);
    await seedDemoInvoices(trx, clinicId, userIds[0]!);
  });
  if (opts.uploadsDir) {
    const clinic = await knex('clinics').where({ name: DEMO_CLINIC_NAME }).first<{ id: number }>('id');
    await seedDemoPictures(knex, clinic.id, opts.uploadsDir, opts.log ?? (() => undefined));
    await seedDemoClips(knex, opts.uploadsDir, opts.log ?? (() => undefined));
  }
  return true;
}

/**
 * Renders the demo runner clips (synthetic figure, see scripts/demo-clip) for the athlete whose
 * push-off was guarded after a hamstring strain — Baseline with ~4° hip extension at toe-off,
 * Re-test with ~11° — and
 * queues them exactly like uploads; the server's worker extracts their frames on start.
 */
async function seedDemoClips(knex: Knex, uploadsDir: string, log: (m: string) => void): Promise<void> {
  log('rendering the demo clips (synthetic runner, about 40 s)…');
  const store = localMediaStore(uploadsDir);
  fs.mkdirSync(uploadTempDir(uploadsDir), { recursive: true });
  const work = fs.mkdtempSync(path.join(uploadTempDir(uploadsDir), 'demo-'));
  try {
    // Six seconds hold about eight steps per side: means of at least 7 steps (Dingenen et al. 2018).
    const clips = await generateDemoClips(work, { seconds: 6 });
    const ada = await knex('athletes').where({ last_name: 'Kestrel' }).first<{ id: number; clinic_id: number; coach_id: number }>();
    const visits = await knex('assessments').where({ athlete_id: ada.id }).orderBy('date');
    const at = new Date().toISOString();
    const seeded: DemoShareClip[] = [];
    for (const [visit, clip] of [
      [visits.find((v) => v.kind === 'baseline'), clips.baseline],
      [visits.find((v) => v.kind === 'retest'), clips.retest],
    ] as const) {
      if (!visit) continue;
      const truth = clip.groundTruth;
      await knex.transaction(async (trx) => {
        const [row] = await trx('clips')
          .insert({
            clinic_id: ada.clinic_id,
            athlete_id: ada.id,
            assessment_id: visit.id,
            uploaded_by: ada.coach_id,
            original_name: `${clip.label.toLowerCase().replace(/[^a-z]+/g, '-')}-treadmill-side.mp4`,
            stored_name: 'original.mp4',
            size_bytes: fs.statSync(clip.videoFile).size,
            container: 'mp4',
            status: 'queued',
            near_side: truth.nearSide,
            direction: truth.facing === 'right' ? 'left_to_right' : 'right_to_left',
            fps: truth.fps,
            width: truth.width,
            height: truth.height,
            frame_count: truth.frameCount,
            duration_s: truth.durationS,
            rotation: 0,
            codec: 'h264',
            created_at: at,
            updated_at: at,
          })
          .returning('id');
        const clipId = (row as { id: number }).id;
        await queueItem(trx, EXTRACT_FRAMES, 'clip', clipId, { clinicId: ada.clinic_id, athleteId: ada.id });
        await store.putFile(clipKeys(clipId).original('original.mp4'), clip.videoFile);
        // Kept beside the clip for checks; never served.
        await store.putFile(`${clipKeys(clipId).prefix}ground-truth.json`, clip.groundTruthFile);
        // Already marked by the coach (events and landmarks at every event), so the measures and
        // the Re-test comparison show real figures straight away.
        await annotationsRepository.replace(trx, clipId, demoMarks(truth));
        await trx('clips').where({ id: clipId }).update({ annotation_revision: 1, annotated_by: ada.coach_id, annotated_at: at });
        seeded.push({ clipId, visit: { id: visit.id, kind: visit.kind, date: visit.date }, truth });
      });
    }
    if (seeded.length === 2)
      await seedDemoShares(knex, { athleteId: ada.id, clinicId: ada.clinic_id, coachId: ada.coach_id, at }, seeded[0]!, seeded[1]!);
    // Her plan since the Baseline, so her sign-in shows today's session to log.
    const retestVisit = visits.find((v) => v.kind === 'retest');
    await knex.transaction((trx) => seedDemoHamstringPlan(trx, ada.clinic_id, ada, retestVisit?.id ?? null));
    log('demo clips queued: the server extracts their frames when it starts, then renders the demo stills and visit summary');
  } finally {
    fs.rmSync(work, { recursive: true, force: true });
  }
}

/** Queues a processed item the way an upload or a coach's request does (the server's workers run it). */
function queueItem(trx: Knex, kind: string, subjectType: string, subjectId: number, scope: { clinicId: number; athleteId: number }) {
  return processedItemsRepository.insert(
    trx,
    { kind, subjectType, subjectId, scope, payload: {} },
    { maxAttempts: 3, at: new Date().toISOString(), by: 'seed' },
  );
}

interface DemoShareClip {
  clipId: number;
  visit: { id: number; kind: AssessmentKind; date: string };
  truth: GroundTruth;
}

/**
 * What the coach shared after the Re-test (invented demo content): a still of each visit at the
 * same right toe-off, published; a side-by-side pair, not yet published; and a published visit
 * summary comparing the two. Queued after the clips' extraction jobs, so they render once the
 * frames exist.
 */
async function seedDemoShares(
  knex: Knex,
  who: { athleteId: number; clinicId: number; coachId: number; at: string },
  baseline: DemoShareClip,
  retest: DemoShareClip,
): Promise<void> {
  const panel = (c: DemoShareClip, step: number) => {
    const frameIndex = c.truth.events.near.toeOff[step]!;
    const scale = Math.min(1, 1280 / Math.max(c.truth.width, c.truth.height));
    return freezePanel({
      clip: {
        id: c.clipId,
        assessmentId: c.visit.id,
        nearSide: c.truth.nearSide,
        direction: c.truth.facing === 'right' ? 'left_to_right' : 'right_to_left',
      },
      assessment: c.visit,
      annotations: { ...demoMarks(c.truth), scale: null },
      frameIndex,
      frameSize: { width: Math.round(c.truth.width * scale), height: Math.round(c.truth.height * scale) },
      timeS: c.truth.frames[frameIndex]!.timeMs / 1000,
    });
  };
  const still = async (
    trx: Knex,
    owner: DemoShareClip,
    panels: ReturnType<typeof panel>[],
    caption: string,
    published: boolean,
  ): Promise<number> => {
    const [row] = await trx('stills')
      .insert({
        clinic_id: who.clinicId,
        athlete_id: who.athleteId,
        assessment_id: owner.visit.id,
        clip_id: owner.clipId,
        kind: panels.length > 1 ? 'pair' : 'frame',
        panels: JSON.stringify(panels),
        caption,
        show_angles: true,
        status: 'rendering',
        render_version: 1,
        published_at: published ? who.at : null,
        published_by: published ? who.coachId : null,
        created_by: who.coachId,
        created_at: who.at,
        updated_at: who.at,
      })
      .returning('id');
    const id = (row as { id: number }).id;
    await queueItem(trx, RENDER_STILL, 'still', id, { clinicId: who.clinicId, athleteId: who.athleteId });
    return id;
  };
  await knex.transaction(async (trx) => {
    const a = await still(
      trx,
      baseline,
      [panel(baseline, 2)],
      'Baseline, right toe-off: the thigh hardly passes vertical — the push-off is cut short.',
      true,
    );
    const b = await still(
      trx,
      retest,
      [panel(retest, 2)],
      'Re-test, right toe-off: the thigh now travels well behind the hip before the foot leaves the belt.',
      true,
    );
    await still(trx, retest, [panel(baseline, 2), panel(retest, 2)], 'Baseline and Re-test side by side at right toe-off.', false);
    const [row] = await trx('visit_summaries')
      .insert({
        clinic_id: who.clinicId,
        athlete_id: who.athleteId,
        assessment_id: retest.visit.id,
        baseline_assessment_id: baseline.visit.id,
        title: 'Re-test comparison: Baseline · 6 Oct 2026 and Re-test · 24 Nov 2026',
        findings:
          'Hip extension at toe-off went from about 4° to about 11°, more than the change expected from measurement error alone: the push-off is no longer held back. The shank is a little more upright at landing, though that change is within measurement error. Cadence is unchanged.',
        plan_text:
          'Carry on with stage 2 (lengthening work) as prescribed. Keep pain during exercise at 3/10 or less and settled by the next morning; sprint finishes and steep descents wait for stage 3. We re-film in six weeks.',
        still_ids: JSON.stringify([a, b]),
        status: 'rendering',
        published_at: who.at,
        published_by: who.coachId,
        created_by: who.coachId,
        created_at: who.at,
        updated_at: who.at,
      })
      .returning('id');
    const id = (row as { id: number }).id;
    await queueItem(trx, RENDER_SUMMARY, 'summary', id, { clinicId: who.clinicId, athleteId: who.athleteId });
  });
}
