import { clinicBrands, type ClinicBrands } from './clinic/clinic-brand';
import type { Logger } from 'pino';
import type { Config } from './config';
import type { Db } from './db/knex';
import type { Mailer } from './mail/mailer';
import { validateEvents } from '../src/kinematics';
import { localMediaStore } from './storage/local-media-store';
import { s3MediaStore } from './storage/s3-media-store';
import type { MediaStore } from './storage/media-store';
import { createProcessing, type Processing } from './processing/processing';
import { inProcessProgressChannel, type ProgressChannel } from './processing/progress-channel';
import type { ItemDispatch } from './processing/item-dispatch';
import { clipsService, type ClipsService } from './clips/clips-service';
import { assessmentsService, type AssessmentsService } from './assessments/assessments-service';
import { annotationsService, type AnnotationsService } from './annotations/annotations-service';
import { followService, type FollowService } from './follow/follow-service';
import { measuresService, type MeasuresService } from './measures/measures-service';
import { stillsService, type StillsService } from './stills/stills-service';
import { summariesService, type SummariesService } from './summaries/summaries-service';
import { annotatedClipsService, type AnnotatedClipsService } from './annotated-clips/annotated-clips-service';
import { dataExportsService, type DataExportsService } from './privacy/data-exports-service';
import { demoClipsService, type DemoClipsService } from './demonstrations/demo-clips-service';

/** The configured media store: the S3-compatible bucket when `config.s3` is set, else folders under `uploadsDir`. */
export function mediaStoreFor(config: Config): MediaStore {
  return config.s3 ? s3MediaStore(config.s3) : localMediaStore(config.uploadsDir);
}

export interface MediaServicesDeps {
  config: Config;
  db: Db;
  mailer: Mailer;
  logger: Logger;
  clock: () => Date;
  /** Media storage; defaults to local folders under `config.uploadsDir`. */
  store?: MediaStore;
  /** The progress channel; defaults to one within this process. */
  channel?: ProgressChannel;
  /** What offers items to workers besides the table (`processingEngine`); none by default. */
  dispatch?: ItemDispatch | null;
  /** The clinics' letterheads for documents; defaults to the logos in `store`. */
  brands?: ClinicBrands;
}

/** The media path's services and the processing layer they register their kinds with. */
export interface MediaServices {
  store: MediaStore;
  processing: Processing;
  clips: ClipsService;
  assessments: AssessmentsService;
  measures: MeasuresService;
  annotations: AnnotationsService;
  follow: FollowService;
  stills: StillsService;
  summaries: SummariesService;
  annotatedClips: AnnotatedClipsService;
  dataExports: DataExportsService;
  demoClips: DemoClipsService;
}

/**
 * Builds the media path (storage, processing, clips, measures, stills, summaries, annotated clips, data exports, demonstration clips) the same way in
 * the web process (`createApp`) and in worker processes (`server/worker.ts`): constructing a
 * service registers its processed-item kinds, so every process knows every kind.
 */
export function createMediaServices(d: MediaServicesDeps): MediaServices {
  const { config, db, mailer, logger, clock } = d;
  const store = d.store ?? mediaStoreFor(config);
  const processing = createProcessing({
    db,
    channel: d.channel ?? inProcessProgressChannel(),
    leaseMs: config.jobs.leaseMs,
    maxAttempts: config.jobs.maxAttempts,
    dispatch: d.dispatch ?? null,
  });
  const clips = clipsService({ db, store, processing, logger });
  const assessments = assessmentsService({ db, clips, store });
  const measures = measuresService({ db, clips });
  const annotations = annotationsService({ db, clips, validateEvents });
  const follow = followService({ db, store, processing, clips, annotations });
  const brands = d.brands ?? clinicBrands({ db, store });
  const sharing = { db, store, processing, clips, mailer, logger, publicUrl: config.publicUrl, clock, brands };
  const stills = stillsService(sharing);
  const summaries = summariesService({ ...sharing, stills, measures });
  const annotatedClips = annotatedClipsService(sharing);
  const dataExports = dataExportsService({ db, store, processing, clock, brands, measures });
  const demoClips = demoClipsService({ db, store, processing, clock });
  return {
    store,
    processing,
    clips,
    assessments,
    measures,
    annotations,
    follow,
    stills,
    summaries,
    annotatedClips,
    dataExports,
    demoClips,
  };
}
