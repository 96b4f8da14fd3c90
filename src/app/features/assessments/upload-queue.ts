/**
 * The upload list as a small state machine. Each chosen file becomes one item and goes
 * waiting → uploading → done | failed | cancelled; files are sent one at a time in the order they
 * were chosen, so a phone's connection is not split between them. Nothing chosen is dropped: a
 * file refused before sending is an item in `failed` with the reason. Pure functions over an
 * immutable list.
 */
import type { Clip } from '../../../contracts/api';
import { UPLOAD } from '../../../contracts/assessment';
import { asHttpError, errorMessage } from '../../core/api-error';

export type UploadState = 'waiting' | 'uploading' | 'done' | 'failed' | 'cancelled';

export interface UploadItem {
  /** Local key of the row. */
  id: number;
  file: File;
  name: string;
  size: number;
  state: UploadState;
  /** Bytes sent so far and the request's total. */
  loaded: number;
  total: number;
  /** Why it failed (the server's message when it sent one). */
  message: string | null;
  /** The clip the server created. */
  clipId: number | null;
  /** Whether the connection dropped and the upload is being retried from what the server holds. */
  reconnecting: boolean;
  /** Whether this upload continues one begun earlier (before a reload, or a cancelled page). */
  resumed: boolean;
  /** Whether it was held back as the same file as a clip already here (sent only on "Upload anyway"). */
  duplicate: boolean;
}

/** A clip the assessment already has, as far as spotting the same file chosen again needs it. */
export interface HeldClip {
  originalName: string;
  sizeBytes: number;
}

/** Why a file matching a clip already here is held back. */
export const ALREADY_HERE =
  'This file is already in this assessment (same name and size): its clip is in the list below. Tap “Upload anyway” to send it a second time.';

const sameFile = (a: { name: string; size: number }, b: { name: string; size: number }) =>
  a.size === b.size && a.name.normalize('NFC') === b.name.normalize('NFC');

const EXTENSIONS = UPLOAD.accept
  .split(',')
  .map((s) => s.trim().toLowerCase())
  .filter((s) => s.startsWith('.'));

/**
 * Why a file cannot be sent at all, or null to send it and let the server decide. Empty files
 * and files the browser knows to be something other than video (an image, a PDF) are refused;
 * a file of unknown type goes to the server, which reads its content.
 */
export function precheck(file: Pick<File, 'name' | 'size' | 'type'>, maxBytes: number | null = null): string | null {
  if (file.size === 0) return 'This file is empty (0 bytes). Choose the video file itself.';
  if (maxBytes !== null && file.size > maxBytes) {
    const limit = maxBytes >= 1024 ** 3 ? `${(maxBytes / 1024 ** 3).toFixed(1)} GB` : `${Math.round(maxBytes / 1024 ** 2)} MB`;
    return `This file is larger than the ${limit} upload limit. Trim the clip to 10–20 seconds and try again.`;
  }
  const type = (file.type || '').toLowerCase();
  const name = file.name.toLowerCase();
  const knownExtension = EXTENSIONS.some((ext) => name.endsWith(ext));
  if (type && !type.startsWith('video/') && !knownExtension) {
    return 'This is not a video file. Choose a video (for example MP4, MOV or WebM).';
  }
  return null;
}

/**
 * Appends the files in order, each waiting, or failed with the reason when `precheck` refuses it
 * (`maxBytes`: the server's upload limit, when known). A file with the name and size of a clip
 * already here (`held`), or of one waiting, uploading or uploaded in this list, is held back as a
 * `duplicate` (failed with `ALREADY_HERE`) instead of silently making a second clip.
 */
export function addFiles(
  items: readonly UploadItem[],
  files: readonly File[],
  nextId: number,
  maxBytes: number | null = null,
  held: readonly HeldClip[] = [],
): { items: UploadItem[]; nextId: number } {
  const taken = [
    ...held.map((c) => ({ name: c.originalName, size: c.sizeBytes })),
    ...items.filter((i) => i.state === 'waiting' || i.state === 'uploading' || i.state === 'done'),
  ];
  const added = files.map((file, i): UploadItem => {
    const problem = precheck(file, maxBytes);
    const duplicate = !problem && [...taken, ...files.slice(0, i)].some((t) => sameFile(t, file));
    return {
      id: nextId + i,
      file,
      name: file.name || 'Unnamed file',
      size: file.size,
      state: problem || duplicate ? 'failed' : 'waiting',
      loaded: 0,
      total: file.size,
      message: problem ?? (duplicate ? ALREADY_HERE : null),
      clipId: null,
      reconnecting: false,
      resumed: false,
      duplicate,
    };
  });
  return { items: [...items, ...added], nextId: nextId + files.length };
}

function update(
  items: readonly UploadItem[],
  id: number,
  from: readonly UploadState[],
  change: (item: UploadItem) => Partial<UploadItem>,
): UploadItem[] {
  return items.map((item) => (item.id === id && from.includes(item.state) ? { ...item, ...change(item) } : item));
}

/** The item to send next: the first waiting one, unless one is already uploading. */
export function nextToStart(items: readonly UploadItem[]): UploadItem | null {
  if (items.some((i) => i.state === 'uploading')) return null;
  return items.find((i) => i.state === 'waiting') ?? null;
}

export function markStarted(items: readonly UploadItem[], id: number): UploadItem[] {
  return update(items, id, ['waiting'], () => ({ state: 'uploading', loaded: 0, message: null, reconnecting: false, resumed: false }));
}

/** The connection dropped: the upload waits to retry from what the server holds. */
export function markReconnecting(items: readonly UploadItem[], id: number): UploadItem[] {
  return update(items, id, ['uploading'], () => ({ reconnecting: true }));
}

/** The server answers again after a lost connection. */
export function markReconnected(items: readonly UploadItem[], id: number): UploadItem[] {
  return update(items, id, ['uploading'], () => ({ reconnecting: false }));
}

/** The upload continues one begun earlier with the same file. */
export function markResumed(items: readonly UploadItem[], id: number): UploadItem[] {
  return update(items, id, ['uploading'], () => ({ resumed: true }));
}

export function markProgress(items: readonly UploadItem[], id: number, loaded: number, total: number): UploadItem[] {
  return update(items, id, ['uploading'], (item) => {
    const t = total > 0 ? total : item.total;
    return { loaded: Math.min(Math.max(loaded, 0), t), total: t };
  });
}

export function markDone(items: readonly UploadItem[], id: number, clip: Pick<Clip, 'id'>): UploadItem[] {
  return update(items, id, ['uploading'], (item) => ({ state: 'done', loaded: item.total, clipId: clip.id }));
}

export function markFailed(items: readonly UploadItem[], id: number, message: string): UploadItem[] {
  return update(items, id, ['uploading', 'waiting'], () => ({ state: 'failed', message }));
}

/** Stops an item that is waiting or uploading (the caller aborts the request). */
export function markCancelled(items: readonly UploadItem[], id: number): UploadItem[] {
  return update(items, id, ['waiting', 'uploading'], () => ({ state: 'cancelled', message: null }));
}

/**
 * Puts a failed or cancelled item back in the line (a refused file is checked again); a held-back
 * duplicate goes as the athlete asked ("Upload anyway").
 */
export function requeue(items: readonly UploadItem[], id: number): UploadItem[] {
  return update(items, id, ['failed', 'cancelled'], (item) => {
    const problem = precheck(item.file);
    return problem
      ? { state: 'failed', message: problem }
      : { state: 'waiting', loaded: 0, total: item.file.size, message: null, duplicate: false };
  });
}

/** Removes an item that is not in flight. */
export function removeItem(items: readonly UploadItem[], id: number): UploadItem[] {
  return items.filter((i) => i.id !== id || i.state === 'uploading' || i.state === 'waiting');
}

/** Removes the finished rows (uploaded or cancelled); failures stay until dismissed. */
export function clearFinished(items: readonly UploadItem[]): UploadItem[] {
  return items.filter((i) => i.state !== 'done' && i.state !== 'cancelled');
}

/** Whether anything is still waiting or being sent. */
export function isBusy(items: readonly UploadItem[]): boolean {
  return items.some((i) => i.state === 'waiting' || i.state === 'uploading');
}

/** Upload progress of an item, 0–100. */
export function uploadPercent(item: Pick<UploadItem, 'loaded' | 'total' | 'state'>): number {
  if (item.state === 'done') return 100;
  return item.total > 0 ? Math.floor((item.loaded / item.total) * 100) : 0;
}

/** The row's status line. */
export function uploadStatusText(item: UploadItem): string {
  switch (item.state) {
    case 'waiting':
      return 'Waiting to upload';
    case 'uploading':
      if (item.reconnecting) return `Connection lost — reconnecting… (${uploadPercent(item)} % kept)`;
      return item.resumed ? `Resuming… ${uploadPercent(item)} %` : `Uploading… ${uploadPercent(item)} %`;
    case 'done':
      return 'Uploaded — processing shown below';
    case 'failed':
      return item.message ?? 'Upload failed.';
    case 'cancelled':
      return 'Cancelled';
  }
}

/**
 * Why an upload failed, for its row: the server's own `error.message` when it sent one (too
 * large, not a video, no consent…), otherwise a plain reason for the status.
 */
export function uploadErrorMessage(err: unknown): string {
  const http = asHttpError(err);
  const body = http?.error as { error?: { message?: unknown } } | null | undefined;
  const serverMessage = body && typeof body === 'object' ? body.error?.message : undefined;
  if (typeof serverMessage === 'string' && serverMessage.trim()) return serverMessage;
  switch (http?.status) {
    case 0:
      return "The upload was interrupted: can't reach the server. What was sent is kept: try again (or choose the same file) to continue.";
    case 409:
      return 'Video consent is needed before clips can be uploaded.';
    case 413:
      return 'This file is larger than the upload limit.';
    case 415:
    case 422:
      return 'This file is not a video the server can read.';
    default:
      return errorMessage(err);
  }
}
