import { z } from 'zod';
import { pageOf } from './projects';
import { schemeSchema } from './scheme';

// Schemes of a project on the server: their list, their saves (versions) and what the engine
// found in each save. The scheme document itself is schemeSchema (scheme.ts).

const id = z.uuid();
const personRef = z.object({ id, displayName: z.string() });
const schemeName = z.string().trim().min(1, 'give the scheme a name').max(200);

/** The newest scheme document version this build reads and writes. */
export const SCHEME_SCHEMA_VERSION = 2;

/** POST /api/projects/:projectId/schemes — a new scheme from the project's design basis. */
export const schemeCreateSchema = z.object({ name: schemeName });
export type SchemeCreate = z.input<typeof schemeCreateSchema>;

/** POST /api/projects/:projectId/schemes/:schemeId/duplicate — a copy of the latest save. */
export const schemeDuplicateSchema = z.object({ name: schemeName.optional() });
export type SchemeDuplicate = z.input<typeof schemeDuplicateSchema>;

/** PATCH /api/projects/:projectId/schemes/:schemeId */
export const schemeRenameSchema = z.object({ name: schemeName });
export type SchemeRename = z.input<typeof schemeRenameSchema>;

/**
 * PUT /api/projects/:projectId/schemes/:schemeId/document — a save. `baseVersion` is the version
 * the editor started from; the save is refused with 409 when a newer one exists.
 */
export const schemeSaveSchema = z.object({
  baseVersion: z.number().int().min(1),
  document: schemeSchema,
});
export type SchemeSave = z.input<typeof schemeSaveSchema>;

export const schemeListQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
  sort: z.enum(['name', 'updatedAt', 'createdAt']).default('updatedAt'),
  direction: z.enum(['asc', 'desc']).default('desc'),
  status: z.enum(['active', 'archived', 'all']).default('active'),
});
export type SchemeListQuery = z.input<typeof schemeListQuerySchema>;

export const schemeVersionsQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
});
export type SchemeVersionsQuery = z.input<typeof schemeVersionsQuerySchema>;

/** What the server's engine run found in one save. */
export const schemeCheckCountsSchema = z.object({
  engineVersion: z.string(),
  /** False when the document has input problems the engine could not analyse past. */
  ok: z.boolean(),
  errors: z.number().int().nonnegative(),
  warnings: z.number().int().nonnegative(),
});
export type SchemeCheckCounts = z.infer<typeof schemeCheckCountsSchema>;

export const schemeListItemSchema = z.object({
  id,
  name: z.string(),
  version: z.number().int().min(1),
  archived: z.boolean(),
  createdAt: z.iso.datetime(),
  updatedAt: z.iso.datetime(),
  savedBy: personRef.nullable(),
  /** Columns in the latest save, for the list. */
  columns: z.number().int().nonnegative(),
  checks: schemeCheckCountsSchema,
});
export type SchemeListItem = z.infer<typeof schemeListItemSchema>;

export const schemeListSchema = pageOf(schemeListItemSchema).extend({
  /** May the caller create, save, rename and archive schemes of this project? */
  canEdit: z.boolean(),
});
export type SchemeList = z.infer<typeof schemeListSchema>;

/** One save, without its document. */
export const schemeVersionSummarySchema = z.object({
  version: z.number().int().min(1),
  savedAt: z.iso.datetime(),
  savedBy: personRef.nullable(),
  /** The earlier version this save brought back, when it was a restore. */
  restoredFrom: z.number().int().min(1).nullable(),
  schemaVersion: z.number().int().min(1),
  checks: schemeCheckCountsSchema,
});
export type SchemeVersionSummary = z.infer<typeof schemeVersionSummarySchema>;
export const schemeVersionListSchema = pageOf(schemeVersionSummarySchema);
export type SchemeVersionList = z.infer<typeof schemeVersionListSchema>;

/** GET /api/projects/:projectId/schemes/:schemeId — the scheme with its latest save. */
export const schemeDetailSchema = z.object({
  id,
  projectId: id,
  name: z.string(),
  archivedAt: z.iso.datetime().nullable(),
  createdAt: z.iso.datetime(),
  canEdit: z.boolean(),
  current: schemeVersionSummarySchema,
  document: schemeSchema,
});
export type SchemeDetail = z.infer<typeof schemeDetailSchema>;

export const checkSeveritySchema = z.enum(['error', 'warning', 'info']);
export type CheckSeverity = z.infer<typeof checkSeveritySchema>;
/** The engine's SOURCE_KINDS (scheme.spec.ts checks that both list the same). */
export const sourceKindSchema = z.enum(['code', 'handbook', 'practice', 'memory', 'derived', 'project']);
export type SourceKindValue = z.infer<typeof sourceKindSchema>;

/** One planning check as the engine reports it (mirror of @trabeate/structural's Check). */
export const schemeCheckSchema = z.object({
  ruleId: z.string(),
  severity: checkSeveritySchema,
  status: z.enum(['pass', 'fail']),
  elements: z.array(z.string()),
  message: z.string(),
  value: z.number(),
  limit: z.number(),
  unit: z.string(),
  sense: z.enum(['max', 'min']),
  source: z.string(),
  sourceKind: sourceKindSchema,
});
export type SchemeCheck = z.infer<typeof schemeCheckSchema>;

export const schemeProblemSchema = z.object({
  path: z.string(),
  elementId: z.string().optional(),
  field: z.string(),
  message: z.string(),
});
export type SchemeProblem = z.infer<typeof schemeProblemSchema>;

/**
 * The engine's results as stored with a save. The parts the screens read are checked; the rest
 * (loads, beam lines, sizes, footings, quantities, cost) passes through as the engine wrote it.
 */
export const schemeResultsSchema = z.looseObject({
  caution: z.string().min(1),
  ok: z.boolean(),
  problems: z.array(schemeProblemSchema),
  checks: z.array(schemeCheckSchema),
  passed: z.array(z.object({ ruleId: z.string(), count: z.number().int(), tightest: schemeCheckSchema })),
});
export type SchemeResults = z.infer<typeof schemeResultsSchema>;

/** GET /api/projects/:projectId/schemes/:schemeId/versions/:version — one save in full. */
export const schemeVersionSchema = schemeVersionSummarySchema.extend({
  document: schemeSchema,
  results: schemeResultsSchema,
});
export type SchemeVersion = z.infer<typeof schemeVersionSchema>;

/** The 409 answer to a save over a newer version: the usual error and the version that is current. */
export const schemeConflictSchema = z.object({
  error: z.object({ code: z.literal('conflict'), message: z.string() }),
  current: schemeVersionSummarySchema,
});
export type SchemeConflict = z.infer<typeof schemeConflictSchema>;
