import type { ObjectStore } from '../storage';

export interface SweepCounts {
  aborted: number;
  kept: number;
}

/** An upload still open after a day was dropped: the largest file streams in well under an hour. */
export const INCOMPLETE_UPLOAD_MAX_AGE_MS = 24 * 60 * 60 * 1000;

/**
 * Aborts multipart uploads begun more than `maxAgeMs` before `now` and never completed, so their
 * parts stop taking space. A dropped upload is normally aborted at once; this catches the ones
 * whose abort could not reach storage (it was down, or the process died mid-upload). Runs as a
 * scheduled job, so with several API processes it still runs once per tick.
 */
export async function sweepIncompleteUploads(
  store: ObjectStore,
  now: Date = new Date(),
  maxAgeMs = INCOMPLETE_UPLOAD_MAX_AGE_MS,
): Promise<SweepCounts> {
  const cutoff = now.getTime() - maxAgeMs;
  let aborted = 0;
  let kept = 0;
  for (const upload of await store.listIncompleteUploads()) {
    if (upload.initiated.getTime() < cutoff) {
      await store.abortUpload(upload.key, upload.uploadId);
      aborted++;
    } else {
      kept++;
    }
  }
  return { aborted, kept };
}

export const UPLOAD_SWEEP_JOB = 'maintenance.sweep-uploads';
/** Hourly, off the hour: a part left behind costs a little storage, not correctness. */
export const UPLOAD_SWEEP_CRON = '41 * * * *';
