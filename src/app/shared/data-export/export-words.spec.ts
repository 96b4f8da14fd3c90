import { describe, expect, it } from 'vitest';
import type { DataExport } from '../../../contracts/privacy';
import { exportLine, isBuilding } from './export-words';

const base: DataExport = {
  id: 1,
  athleteId: 2,
  status: 'ready',
  progress: 1,
  error: null,
  sizeBytes: 14_200_000,
  fileCount: 7,
  createdAt: '2026-12-05T10:00:00.000Z',
  readyAt: '2026-12-05T10:01:00.000Z',
  expiresAt: '2026-12-06T10:01:00.000Z',
  downloadUrl: '/api/data-exports/1/download',
};

describe('export words', () => {
  it('says how far a build is, what a ready zip holds, and what to do after expiry or failure', () => {
    expect(exportLine({ ...base, status: 'building', progress: 0.426 })).toBe('Preparing… 43 %');
    expect(exportLine(base)).toBe('Ready · 14.2 MB, 7 files');
    expect(exportLine({ ...base, status: 'expired' })).toMatch(/expired; prepare a new export/);
    expect(exportLine({ ...base, status: 'failed', error: 'The export could not be built: disk full' })).toMatch(/disk full/);
  });

  it('knows whether an export is still being built', () => {
    expect(isBuilding([base])).toBe(false);
    expect(isBuilding([base, { ...base, id: 2, status: 'building' }])).toBe(true);
  });
});
