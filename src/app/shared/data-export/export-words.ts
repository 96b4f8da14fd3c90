import type { DataExport } from '../../../contracts/privacy';
import { formatBytes } from '../clip-status';

/** One line saying where an export stands, for the list under "Prepare export". */
export function exportLine(e: DataExport): string {
  switch (e.status) {
    case 'building':
      return `Preparing… ${Math.round(e.progress * 100)} %`;
    case 'ready':
      return `Ready · ${formatBytes(e.sizeBytes ?? 0)}, ${e.fileCount ?? 0} files`;
    case 'expired':
      return 'The download link has expired; prepare a new export.';
    case 'failed':
      return e.error ?? 'The export could not be prepared. Try again.';
  }
}

/** Whether an export is still being built (the page follows its progress). */
export function isBuilding(exports: readonly DataExport[]): boolean {
  return exports.some((e) => e.status === 'building');
}
