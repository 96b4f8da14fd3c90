import { once } from 'node:events';
import { selectRows } from '../db/dialect';
import type { Readable } from 'node:stream';
import type { Db } from '../db/knex';
import type { ClinicBrands } from '../clinic/clinic-brand';
import { invoicesRepository, toDetail } from '../billing/invoices-repository';
import { renderReceipt } from '../billing/receipt-pdf';
import { PermanentError, type ProcessingKind } from '../processing/processed-item';
import { clipKeys, exportKey, summaryKey } from '../storage/media-keys';
import type { MediaStore } from '../storage/media-store';
import type { MeasuresService } from '../measures/measures-service';
import { EXPORT_LINK_HOURS } from '../../src/contracts/privacy';
import { ATHLETE_TABLES, ATHLETE_TABLE_NAMES } from './athlete-tables';
import { exportReadme, type MissingFile } from './export-readme';

/** The kind that builds an athlete's data export zip. */
export const EXPORT_ATHLETE_DATA = 'export_athlete_data';

/** One file of the zip: stored media by key, or bytes made while building (receipts). */
type ZipFile = { name: string; key: string } | { name: string; make: () => Promise<Buffer> };

/** Reads every row about the athlete, table by table, without the secret columns. */
export async function athleteRows(db: Db, athleteId: number): Promise<Record<string, Record<string, unknown>[]>> {
  const out: Record<string, Record<string, unknown>[]> = {};
  for (const name of ATHLETE_TABLE_NAMES) {
    const t = ATHLETE_TABLES[name];
    const rows = await selectRows<Record<string, unknown>>(db, `SELECT * FROM ${name} WHERE ${t.where}`, [athleteId]);
    const omit: readonly string[] = 'omit' in t ? t.omit : [];
    out[name] = rows.map((r) => Object.fromEntries(Object.entries(r).filter(([k]) => !omit.includes(k))));
  }
  return out;
}

/**
 * Saves do not compute measures (their first read does), so the export brings every ready clip's
 * measures snapshot up to its latest marks first: data.json then holds the measures of the marks
 * it holds.
 */
async function refreshMeasures(db: Db, measures: MeasuresService, athleteId: number): Promise<void> {
  const assessments = await db('assessments').where({ athlete_id: athleteId }).pluck<number[]>('id');
  for (const id of assessments) await measures.ofAssessment(id);
}

/** A name safe inside a zip: no folders, no control characters, at most 120 characters. */
function zipName(name: string): string {
  // eslint-disable-next-line no-control-regex
  const clean = name.replace(/[\\/\u0000-\u001f\u007f]/g, '_').replace(/^\.+/, '_');
  return clean.slice(-120) || 'clip';
}

/** The media files of the export, by the rows read for data.json. */
async function plannedFiles(d: { db: Db; brands: ClinicBrands }, rows: Record<string, Record<string, unknown>[]>): Promise<ZipFile[]> {
  const files: ZipFile[] = [];
  const shared = (r: Record<string, unknown>) => (r['published_at'] ? 'published' : 'unpublished');
  for (const c of rows['clips'] ?? [])
    files.push({
      name: `clips/${c['id']}-${zipName(String(c['original_name']))}`,
      key: clipKeys(Number(c['id'])).original(String(c['stored_name'])),
    });
  for (const s of rows['stills'] ?? [])
    if (s['status'] === 'ready' && s['clip_id'])
      files.push({
        name: `stills/${shared(s)}/still-${s['id']}.png`,
        key: clipKeys(Number(s['clip_id'])).still(Number(s['id']), Number(s['render_version']), 'png'),
      });
  for (const s of rows['visit_summaries'] ?? [])
    if (s['status'] === 'ready')
      files.push({ name: `summaries/${shared(s)}/summary-${s['id']}.pdf`, key: summaryKey(Number(s['assessment_id']), Number(s['id'])) });
  for (const a of rows['annotated_clips'] ?? [])
    if (a['status'] === 'ready')
      files.push({
        name: `annotated-clips/${shared(a)}/annotated-clip-${a['id']}.mp4`,
        key: clipKeys(Number(a['clip_id'])).annotated(Number(a['id']), Number(a['render_version'])),
      });
  for (const inv of rows['invoices'] ?? []) {
    if (inv['status'] !== 'paid' && inv['status'] !== 'refunded') continue;
    const id = Number(inv['id']);
    files.push({
      name: `receipts/receipt-${zipName(String(inv['number']))}.pdf`,
      make: async () => {
        const row = await invoicesRepository.findById(d.db, id);
        if (!row) throw new PermanentError('An invoice went while the export was built.');
        const clinic = await d.db('clinics').where({ id: row.clinic_id }).first<{ name: string }>('name');
        const brand = await d.brands.forDocuments(row.clinic_id);
        const detail = toDetail(row, await invoicesRepository.lines(d.db, id), clinic.name, brand.legal);
        return renderReceipt(detail, brand.logo);
      },
    });
  }
  return files;
}

/** What a finished build leaves for `onReady`. */
interface Built {
  sizeBytes: number;
  fileCount: number;
}

/**
 * The export as a processed item about a `data_exports` row: reads every athlete table into
 * data.json, then streams each stored file into one zip written to the store by key (one file open
 * at a time, never a whole file in memory), with progress per file on the athlete's stream.
 */
export function exportAthleteDataKind(d: {
  db: Db;
  store: MediaStore;
  clock: () => Date;
  brands: ClinicBrands;
  measures: MeasuresService;
}): ProcessingKind<Built | null> {
  const { db, store, clock } = d;
  return {
    name: EXPORT_ATHLETE_DATA,
    subject: 'data_export',
    athleteSees: true,

    async run(item, ctx) {
      const row = await db('data_exports').where({ id: item.subjectId }).first<{ id: number; athlete_id: number; clinic_id: number }>();
      if (!row) return null;
      const exportedAt = clock().toISOString();
      await refreshMeasures(db, d.measures, row.athlete_id);
      const rows = await athleteRows(db, row.athlete_id);
      const files = await plannedFiles(d, rows);
      const total = files.length + 2;
      ctx.progress(0, total);
      const key = exportKey(row.athlete_id, row.id);
      // archiver loads with the first export, not with every web process.
      const { default: archiver } = await import('archiver');
      const zip = archiver('zip', { zlib: { level: 6 } });
      const written = store.put(key, zip as unknown as Readable);
      let failure: unknown = null;
      zip.on('error', (err) => (failure = err));
      zip.on('warning', (err) => (failure = err));
      const add = async (body: Readable | Buffer | string, name: string, storeOnly: boolean) => {
        const done = once(zip, 'entry');
        zip.append(body, { name, store: storeOnly, date: new Date(exportedAt) });
        await done;
      };
      const missing: MissingFile[] = [];
      try {
        const data = { format: 'trailframe-athlete-data', version: 1, exportedAt, athleteId: row.athlete_id, tables: rows };
        await add(JSON.stringify(data, null, 2), 'data.json', false);
        let n = 1;
        for (const f of files) {
          if (ctx.signal.aborted) throw new Error('The export was cancelled.');
          if ('key' in f) {
            if (await store.stat(f.key)) await add(await store.get(f.key), f.name, true);
            else missing.push({ name: f.name, why: 'the stored file is missing' });
          } else {
            await add(await f.make(), f.name, true);
          }
          ctx.progress(++n, total);
          if (failure) throw failure;
        }
        const clinic = await db('clinics').where({ id: row.clinic_id }).first<{ name: string }>('name');
        await add(
          exportReadme({ clinicName: clinic?.name ?? 'The clinic', exportedAt, athleteId: row.athlete_id, missing }),
          'README.txt',
          false,
        );
        await zip.finalize();
        await written;
        if (failure) throw failure;
      } catch (err) {
        zip.abort();
        await written.catch(() => undefined);
        await store.remove(key);
        throw err;
      }
      const stat = await store.stat(key);
      const still = await db('data_exports').where({ id: row.id }).first('id');
      if (!still) {
        await store.remove(key); // erased meanwhile
        return null;
      }
      return { sizeBytes: stat?.size ?? 0, fileCount: files.length - missing.length + 2 };
    },

    async onReady(trx, item, built) {
      if (!built) return;
      const now = clock();
      await trx('data_exports')
        .where({ id: item.subjectId })
        .update({
          status: 'ready',
          error: null,
          size_bytes: built.sizeBytes,
          file_count: built.fileCount,
          ready_at: now.toISOString(),
          expires_at: new Date(now.getTime() + EXPORT_LINK_HOURS * 3_600_000).toISOString(),
        });
    },

    async onChange(trx, item, change) {
      if (change.state === 'failed')
        await trx('data_exports')
          .where({ id: item.subjectId })
          .update({ status: 'failed', error: `The export could not be built: ${change.reason}` });
      else if (change.state === 'queued' && !change.retry)
        await trx('data_exports').where({ id: item.subjectId }).update({ status: 'building' });
    },
  };
}
