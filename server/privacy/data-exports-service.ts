import type { SessionUser } from '../../src/contracts/api';
import type { DataExport } from '../../src/contracts/privacy';
import { audit } from '../audit/audit-log';
import type { Db } from '../db/knex';
import { lockedForUpdate } from '../db/dialect';
import { ConflictError, GoneError, NotFoundError } from '../errors';
import { accessibleAthlete, assertAthleteResource } from '../policy/athlete-resources';
import type { Processing } from '../processing/processing';
import { exportKey } from '../storage/media-keys';
import type { MeasuresService } from '../measures/measures-service';
import type { MediaStore } from '../storage/media-store';
import type { ClinicBrands } from '../clinic/clinic-brand';
import { EXPORT_ATHLETE_DATA, exportAthleteDataKind } from './export-kind';

/** A `data_exports` row. */
export interface DataExportRow {
  id: number;
  clinic_id: number;
  athlete_id: number;
  requested_by: number | null;
  status: 'building' | 'ready' | 'failed';
  error: string | null;
  size_bytes: number | null;
  file_count: number | null;
  ready_at: string | null;
  expires_at: string | null;
  created_at: string;
}

/** Exports of everything held about an athlete: start one, list them, download a ready one before its link expires. */
export interface DataExportsService {
  list(user: SessionUser, athleteId: number): Promise<DataExport[]>;
  start(user: SessionUser, athleteId: number): Promise<DataExport>;
  /** The zip's key and download name; audited. 409 while building, 410 once expired. */
  download(user: SessionUser, exportId: number): Promise<{ key: string; filename: string }>;
  /** Removes the zips whose links have expired; answers how many. */
  sweepExpired(): Promise<number>;
}

export const EXPORT_EXPIRED_MESSAGE =
  'This download link has expired (links last 24 hours). Start a new export to download your data again.';

export function dataExportsService(d: {
  db: Db;
  store: MediaStore;
  processing: Processing;
  clock: () => Date;
  brands: ClinicBrands;
  measures: MeasuresService;
}): DataExportsService {
  const { db, store, processing, clock } = d;
  processing.register(exportAthleteDataKind(d));

  const expired = (r: DataExportRow) => r.status === 'ready' && !!r.expires_at && r.expires_at <= clock().toISOString();

  async function view(r: DataExportRow): Promise<DataExport> {
    const item = r.status === 'building' ? await processing.latest('data_export', r.id) : null;
    const status = expired(r) ? 'expired' : r.status;
    return {
      id: r.id,
      athleteId: r.athlete_id,
      status,
      progress: r.status === 'ready' ? 1 : item?.progress && item.progress.total > 0 ? item.progress.done / item.progress.total : 0,
      error: r.error,
      sizeBytes: r.size_bytes,
      fileCount: r.file_count,
      createdAt: r.created_at,
      readyAt: r.ready_at,
      expiresAt: r.expires_at,
      downloadUrl: status === 'ready' ? `/api/data-exports/${r.id}/download` : null,
    };
  }

  return {
    async list(user, athleteId) {
      await accessibleAthlete(db, user, athleteId, 'data-export:list');
      const rows = await db<DataExportRow>('data_exports')
        .where({ athlete_id: athleteId, clinic_id: user.clinicId })
        .orderBy('id', 'desc')
        .limit(10);
      return Promise.all(rows.map(view));
    },

    async start(user, athleteId) {
      await accessibleAthlete(db, user, athleteId, 'data-export:create');
      const at = clock().toISOString();
      const id = await db.transaction(async (trx) => {
        // One start at a time per athlete (PostgreSQL; SQLite has one writer): the second of two sent together sees the first building.
        // An erasure that committed while this waited leaves nothing to export: 404 as for any erased athlete.
        const [held] = (await lockedForUpdate(trx, trx('athletes').where({ id: athleteId }).select('id', 'erased_at'))) as {
          erased_at: string | null;
        }[];
        if (!held || held.erased_at) throw new NotFoundError('Athlete');
        const running = await trx('data_exports').where({ athlete_id: athleteId, status: 'building' }).first('id');
        if (running) throw new ConflictError('An export of this athlete’s data is being built; wait for it to finish.', 'export_running');
        const [r] = await trx('data_exports')
          .insert({ clinic_id: user.clinicId, athlete_id: athleteId, requested_by: user.id, status: 'building', created_at: at })
          .returning('id');
        const exportId = (r as { id: number }).id;
        await processing.enqueue(trx, EXPORT_ATHLETE_DATA, exportId, { clinicId: user.clinicId, athleteId });
        await audit(
          trx,
          { clinicId: user.clinicId, actorId: user.id, athleteId, action: 'athlete.data_export_requested', detail: { exportId } },
          at,
        );
        return exportId;
      });
      return view((await db<DataExportRow>('data_exports').where({ id }).first())!);
    },

    async download(user, exportId) {
      const row = await db<DataExportRow>('data_exports').where({ id: exportId, clinic_id: user.clinicId }).first();
      if (!row) throw new NotFoundError('Export');
      await assertAthleteResource(db, user, 'data-export:download', row, 'Export');
      if (expired(row)) throw new GoneError(EXPORT_EXPIRED_MESSAGE, 'export_expired');
      if (row.status !== 'ready')
        throw new ConflictError('This export is not ready yet; its progress shows on the page.', 'export_not_ready');
      await audit(
        db,
        {
          clinicId: user.clinicId,
          actorId: user.id,
          athleteId: row.athlete_id,
          action: 'athlete.data_export_downloaded',
          detail: { exportId },
        },
        clock().toISOString(),
      );
      const date = (row.ready_at ?? row.created_at).slice(0, 10);
      return { key: exportKey(row.athlete_id, row.id), filename: `trailframe-data-${row.athlete_id}-${date}.zip` };
    },

    async sweepExpired() {
      const rows = await db<DataExportRow>('data_exports').where({ status: 'ready' }).andWhere('expires_at', '<=', clock().toISOString());
      for (const r of rows) await store.remove(exportKey(r.athlete_id, r.id));
      return rows.length;
    },
  };
}
