import type { RevisionState } from '@trabeate/contracts';

/** Each state has words and its own glyph, so it never rests on colour alone. */
export const REVISION_STATE_LABELS: Record<RevisionState, { label: string; glyph: string }> = {
  draft: { label: 'Draft', glyph: 'edit_note' },
  checked: { label: 'Checked', glyph: 'fact_check' },
  approved: { label: 'Approved', glyph: 'task_alt' },
  issued: { label: 'Issued', glyph: 'outbox' },
  superseded: { label: 'Superseded', glyph: 'layers_clear' },
};

export const formatBytes = (n: number): string =>
  n < 1024 ? `${n} bytes` : n < 1024 ** 2 ? `${(n / 1024).toFixed(1)} KiB` : `${(n / 1024 ** 2).toFixed(1)} MiB`;
