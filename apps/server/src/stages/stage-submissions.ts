import type { Knex } from 'knex';
import {
  checkKey,
  isSchemeStage,
  schemeResultsSchema,
  STAGE_TITLES,
  type CheckJustification,
  type CheckSummary,
  type SchemeResults,
  type StageKey,
  type StageSubmission,
  type StageSubmissionList,
  type StageTransition,
} from '@trabeate/contracts';
import type { Db } from '../db/db';
import { HttpError } from '../core/errors';

// The submission record of a stage, and the gate in front of it: a stage that rests on a scheme is
// submitted with one scheme version, and every error-level check in that version's stored results
// is either gone or answered by a justification. The engine is not run again here: the review
// sees exactly what the save stored.

type Q = Db | Knex.Transaction;
type SubmitInput = Extract<StageTransition, { action: 'submit' }>;

/** What the gate found, ready to be stored with the submission. */
export interface SubmissionBasis {
  scheme: { id: string; name: string; version: number } | null;
  summary: CheckSummary | null;
  justifications: CheckJustification[];
}

const invalid = (field: string, message: string, detail: string) =>
  new HttpError(400, 'validation_failed', message, { [field]: [detail] });

/** Errors and warnings that fail, counted per rule (errors first, then by rule id). */
export function summariseChecks(results: SchemeResults, engineVersion: string): CheckSummary {
  const failing = results.checks
    .filter((c) => c.status === 'fail' && c.severity !== 'info')
    .map((c) => ({
      ruleId: c.ruleId,
      severity: c.severity as 'error' | 'warning',
      elements: c.elements,
      message: c.message,
      source: c.source,
      sourceKind: c.sourceKind,
    }));
  const perRule = new Map<string, { ruleId: string; errors: number; warnings: number }>();
  for (const c of failing) {
    const r = perRule.get(c.ruleId) ?? { ruleId: c.ruleId, errors: 0, warnings: 0 };
    if (c.severity === 'error') r.errors++;
    else r.warnings++;
    perRule.set(c.ruleId, r);
  }
  const rules = [...perRule.values()].sort((a, b) => b.errors - a.errors || a.ruleId.localeCompare(b.ruleId));
  return {
    engineVersion,
    errors: failing.filter((c) => c.severity === 'error').length,
    warnings: failing.filter((c) => c.severity === 'warning').length,
    rules,
    failing: [...failing].sort((a, b) => (a.severity === b.severity ? 0 : a.severity === 'error' ? -1 : 1)),
  };
}

/**
 * Checks a submission against the stored results of the scheme version it names. A client's
 * mistake (a scheme for a stage without one, an unknown scheme or version, a justification for a
 * check that is not an error at that version) is a 400; error-level checks left unanswered are a
 * 409 naming each by rule id and elements.
 */
export async function submissionBasis(
  trx: Knex.Transaction,
  projectId: string,
  key: StageKey,
  input: SubmitInput,
): Promise<SubmissionBasis> {
  const title = STAGE_TITLES[key];
  if (!isSchemeStage(key)) {
    if (input.scheme || input.justifications?.length)
      throw invalid('body.scheme', `${title} is not submitted with a scheme.`, 'this stage does not rest on a scheme');
    return { scheme: null, summary: null, justifications: [] };
  }
  if (!input.scheme)
    throw invalid(
      'body.scheme',
      `${title} is submitted with the scheme it rests on: choose one of the project's schemes.`,
      'choose a scheme',
    );
  // Shared lock: a save may not slip in between reading the version and recording it.
  const scheme = await trx('schemes')
    .where({ id: input.scheme.schemeId, project_id: projectId })
    .forShare()
    .first('id', 'name', 'current_version');
  if (!scheme)
    throw invalid('body.scheme.schemeId', 'This project has no scheme with that id.', 'not a scheme of this project');
  const version = input.scheme.version ?? scheme.current_version;
  const row = await trx('scheme_versions').where({ scheme_id: scheme.id, version }).first('results', 'engine_version');
  if (!row)
    throw invalid(
      'body.scheme.version',
      `${scheme.name} has no version ${version}; its latest save is version ${scheme.current_version}.`,
      'no such version',
    );
  const results = schemeResultsSchema.parse(row.results);
  if (!results.ok)
    throw new HttpError(
      409,
      'conflict',
      `${scheme.name} version ${version} has input problems the checks could not get past (${results.problems.length}); fix them in the planning workspace and save before submitting ${title}.`,
    );

  const errors = new Map<string, { ruleId: string; elements: string[]; message: string }>();
  for (const c of results.checks) if (c.status === 'fail' && c.severity === 'error') errors.set(checkKey(c), c);

  const given = new Map<string, CheckJustification>();
  (input.justifications ?? []).forEach((j, i) => {
    const k = checkKey(j);
    if (!errors.has(k))
      throw invalid(
        `body.justifications.${i}`,
        `${scheme.name} version ${version} has no error-level check ${k} to justify.`,
        'no such error-level check at this version',
      );
    if (given.has(k))
      throw invalid(`body.justifications.${i}`, `The check ${k} is justified twice.`, 'justified twice');
    given.set(k, j);
  });

  const missing = [...errors.entries()].filter(([k]) => !given.has(k));
  if (missing.length) {
    const names = missing.map(([k]) => k);
    throw new HttpError(
      409,
      'conflict',
      `${title} cannot be submitted with ${scheme.name} version ${version} while ${missing.length === 1 ? 'an error-level check stands' : `${missing.length} error-level checks stand`} without a justification: ${names.join('; ')}.`,
      Object.fromEntries(missing.map(([k, c]) => [k, [`justify or resolve: ${c.message}`]])),
    );
  }
  return {
    scheme: { id: scheme.id, name: scheme.name, version },
    summary: summariseChecks(results, row.engine_version),
    justifications: [...given.values()],
  };
}

export async function insertSubmission(
  trx: Knex.Transaction,
  s: {
    firmId: string;
    projectId: string;
    key: StageKey;
    submittedBy: string;
    comment: string | undefined;
    basis: SubmissionBasis;
  },
): Promise<string> {
  const [{ id }] = await trx('stage_submissions')
    .insert({
      firm_id: s.firmId,
      project_id: s.projectId,
      stage_key: s.key,
      submitted_by: s.submittedBy,
      comment: s.comment || null,
      scheme_id: s.basis.scheme?.id ?? null,
      scheme_version: s.basis.scheme?.version ?? null,
      check_summary: s.basis.summary ? JSON.stringify(s.basis.summary) : null,
      justifications: JSON.stringify(s.basis.justifications),
    })
    .returning('id');
  return id;
}

/** The submission awaiting a decision (the latest one, while it has none), locked with the stage. */
export async function openSubmission(
  trx: Knex.Transaction,
  projectId: string,
  key: StageKey,
): Promise<{ id: string; scheme_name: string | null; scheme_version: number | null } | undefined> {
  const latest = await trx('stage_submissions as s')
    .leftJoin('schemes as sc', 'sc.id', 's.scheme_id')
    .where({ 's.project_id': projectId, 's.stage_key': key })
    .orderBy([
      { column: 's.submitted_at', order: 'desc' },
      { column: 's.id', order: 'desc' },
    ])
    .first('s.id', 's.decision', 'sc.name as scheme_name', 's.scheme_version');
  return latest && !latest.decision ? latest : undefined;
}

export async function recordDecision(
  trx: Knex.Transaction,
  submissionId: string,
  d: { outcome: 'approved' | 'returned'; by: string; comment: string | undefined; invoiceId: string | null },
): Promise<void> {
  await trx('stage_submissions')
    .where({ id: submissionId })
    .update({
      decision: d.outcome,
      decided_by: d.by,
      decided_at: trx.fn.now(),
      decision_comment: d.comment || null,
      offered_invoice_id: d.invoiceId,
    });
}

interface SubmissionRow {
  id: string;
  stage_key: StageKey;
  submitted_at: Date;
  submitted_by: string;
  submitter_name: string;
  comment: string | null;
  scheme_id: string | null;
  scheme_name: string | null;
  scheme_version: number | null;
  current_version: number | null;
  check_summary: CheckSummary | null;
  justifications: CheckJustification[];
  decision: 'approved' | 'returned' | null;
  decided_by: string | null;
  decider_name: string | null;
  decided_at: Date | null;
  decision_comment: string | null;
  invoice_id: string | null;
  invoice_number: string | null;
  invoice_state: 'draft' | 'issued' | 'part_paid' | 'paid' | 'void' | null;
  invoice_total: string | null;
  invoice_currency: string | null;
}

/** The newest finished report of one scheme version, as the review links it. */
interface ReportLink {
  id: string;
  project_id: string;
  scheme_id: string;
  scheme_version: number;
  pages: number | null;
  finished_at: Date;
}

const reportLinkOf = (f: ReportLink | undefined) =>
  f
    ? {
        id: f.id,
        pages: f.pages,
        finishedAt: new Date(f.finished_at).toISOString(),
        fileUrl: `/api/projects/${f.project_id}/scheme-reports/${f.id}/file`,
      }
    : null;

const submissionOf = (r: SubmissionRow, reports: Map<string, ReportLink>): StageSubmission => ({
  id: r.id,
  stageKey: r.stage_key,
  submittedAt: new Date(r.submitted_at).toISOString(),
  submittedBy: { id: r.submitted_by, displayName: r.submitter_name },
  comment: r.comment,
  scheme:
    r.scheme_id && r.scheme_version
      ? {
          id: r.scheme_id,
          name: r.scheme_name ?? '',
          version: r.scheme_version,
          currentVersion: r.current_version ?? r.scheme_version,
          changedSinceSubmitted: (r.current_version ?? r.scheme_version) > r.scheme_version,
          report: reportLinkOf(reports.get(`${r.scheme_id}/${r.scheme_version}`)),
        }
      : null,
  checks: r.check_summary,
  justifications: r.justifications,
  decision:
    r.decision && r.decided_by && r.decided_at
      ? {
          outcome: r.decision,
          by: { id: r.decided_by, displayName: r.decider_name ?? '' },
          at: new Date(r.decided_at).toISOString(),
          comment: r.decision_comment,
          offeredInvoice:
            r.invoice_id && r.invoice_state && r.invoice_currency
              ? {
                  id: r.invoice_id,
                  number: r.invoice_number,
                  state: r.invoice_state,
                  totalMinor: Number(r.invoice_total),
                  currency: r.invoice_currency.trim(),
                }
              : null,
        }
      : null,
});

/** Every submission of the stage, newest first (the firm's view: clients never reach this). */
export async function listSubmissions(db: Q, projectId: string, key: StageKey): Promise<StageSubmissionList> {
  const rows: SubmissionRow[] = await db('stage_submissions as s')
    .join('users as su', 'su.id', 's.submitted_by')
    .leftJoin('users as du', 'du.id', 's.decided_by')
    .leftJoin('schemes as sc', 'sc.id', 's.scheme_id')
    .leftJoin('invoices as i', 'i.id', 's.offered_invoice_id')
    .where({ 's.project_id': projectId, 's.stage_key': key })
    .orderBy([
      { column: 's.submitted_at', order: 'desc' },
      { column: 's.id', order: 'desc' },
    ])
    .select(
      's.id',
      's.stage_key',
      's.submitted_at',
      's.submitted_by',
      'su.display_name as submitter_name',
      's.comment',
      's.scheme_id',
      'sc.name as scheme_name',
      's.scheme_version',
      'sc.current_version',
      's.check_summary',
      's.justifications',
      's.decision',
      's.decided_by',
      'du.display_name as decider_name',
      's.decided_at',
      's.decision_comment',
      'i.id as invoice_id',
      'i.number as invoice_number',
      'i.state as invoice_state',
      'i.total_minor as invoice_total',
      'i.currency as invoice_currency',
    );
  // The review links a report already written for the submitted version (the newest finished one),
  // so the principal need not generate another.
  const versions = rows.filter((r) => r.scheme_id && r.scheme_version).map((r) => [r.scheme_id!, r.scheme_version!]);
  const reports = new Map<string, ReportLink>();
  if (versions.length) {
    const found: ReportLink[] = await db('scheme_reports')
      .where({ project_id: projectId, state: 'done' })
      .whereNotNull('object_key')
      .whereIn(['scheme_id', 'scheme_version'], versions)
      .orderBy([
        { column: 'finished_at', order: 'desc' },
        { column: 'id', order: 'desc' },
      ])
      .select('id', 'project_id', 'scheme_id', 'scheme_version', 'pages', 'finished_at');
    for (const f of found) {
      const k = `${f.scheme_id}/${f.scheme_version}`;
      if (!reports.has(k)) reports.set(k, f);
    }
  }
  return { items: rows.map((r) => submissionOf(r, reports)) };
}
