import type { RevisionState } from '@trabeate/contracts';
import type { MarkerShape, MarkerTone } from '../../shared/state-marker/state-marker';

/**
 * Each revision state in words with its shape in the shared state marker, so it never rests on
 * colour alone: drawn (open ring), checked (half), approved (square with a tick), issued (the
 * same, in the accent: it has gone out), superseded (the barred square: no longer to be used).
 */
export const REVISION_STATE_LABELS: Record<RevisionState, { label: string; shape: MarkerShape; tone: MarkerTone }> = {
  draft: { label: 'Draft', shape: 'open', tone: 'neutral' },
  checked: { label: 'Checked', shape: 'half', tone: 'neutral' },
  approved: { label: 'Approved', shape: 'done', tone: 'neutral' },
  issued: { label: 'Issued', shape: 'done', tone: 'accent' },
  superseded: { label: 'Superseded', shape: 'stop', tone: 'neutral' },
};

export const formatBytes = (n: number): string =>
  n < 1024 ? `${n} bytes` : n < 1024 ** 2 ? `${(n / 1024).toFixed(1)} KiB` : `${(n / 1024 ** 2).toFixed(1)} MiB`;
