import { z } from 'zod';
import { projectAbilitiesSchema } from './auth';
import { codeFamilySchema } from './scheme';

// Projects, their design stages, deliverables, comments and the activity log. The server
// validates with these; the client imports the types only.

const id = z.uuid();
const isoDate = z.iso.date(); // YYYY-MM-DD
const personRef = z.object({ id, displayName: z.string() });

/**
 * The project's unit rates for the cost of a scheme, in the project's currency (major units, so a
 * rate per kg may have cents). The bounds are the scheme document's (unitRatesSchema).
 */
export const projectUnitRatesSchema = z.object({
  concretePerM3: z.number().nonnegative().max(1e9),
  steelPerKg: z.number().nonnegative().max(1e9),
  formworkPerM2: z.number().nonnegative().max(1e9),
});
export type ProjectUnitRates = z.infer<typeof projectUnitRatesSchema>;

/**
 * The design basis a project's schemes start from (SI units: MPa, kPa, m). Unit rates are
 * optional: projects set up before they were asked for have none, and their schemes start at zero.
 */
export const projectDesignBasisSchema = z.object({
  codeFamily: codeFamilySchema,
  concreteMPa: z.number().min(10).max(120),
  steelMPa: z.number().min(200).max(700),
  imposedKPa: z.number().min(0).max(50),
  superimposedDeadKPa: z.number().min(0).max(50),
  bearingPressureKPa: z.number().positive().max(5000),
  foundingDepthM: z.number().min(0).max(30),
  rates: projectUnitRatesSchema.optional(),
});
export type ProjectDesignBasis = z.infer<typeof projectDesignBasisSchema>;

export const projectReferenceSchema = z
  .string()
  .trim()
  .min(2)
  .max(32)
  .regex(/^[A-Za-z0-9][A-Za-z0-9._/-]*$/, 'letters, digits and . _ / - only, starting with a letter or digit');

export const projectWriteSchema = z.object({
  reference: projectReferenceSchema,
  name: z.string().trim().min(1).max(160),
  clientOrganisationId: id,
  siteAddress: z.string().trim().max(300).default(''),
  buildingUse: z.string().trim().max(300).default(''),
  storeys: z.number().int().min(1).max(200),
  storeyHeightM: z.number().min(2).max(12),
  floorAreaM2: z.number().positive().max(10_000_000).nullable().default(null),
  estimatedCost: z.number().nonnegative().max(1e13).nullable().default(null),
  currency: z.string().regex(/^[A-Z]{3}$/, 'a three-letter currency code such as EUR'),
  designBasis: projectDesignBasisSchema,
});
/** POST /api/projects */
export const projectCreateSchema = projectWriteSchema;
export type ProjectCreate = z.input<typeof projectCreateSchema>;
/**
 * PATCH /api/projects/:projectId — any subset of the fields. The create defaults are taken off
 * first: with them, `.partial()` would fill every absent field with its default and a PATCH of the
 * name alone would clear the site address.
 */
export const projectUpdateSchema = projectWriteSchema
  .extend({
    siteAddress: z.string().trim().max(300),
    buildingUse: z.string().trim().max(300),
    floorAreaM2: z.number().positive().max(10_000_000).nullable(),
    estimatedCost: z.number().nonnegative().max(1e13).nullable(),
  })
  .partial()
  .refine((v) => Object.keys(v).length > 0, { message: 'nothing to change' });
export type ProjectUpdate = z.input<typeof projectUpdateSchema>;

export const STAGE_KEYS = [
  'design_basis',
  'column_layout',
  'beam_framing',
  'slab_panels',
  'stairs',
  'foundations',
] as const;
export const stageKeySchema = z.enum(STAGE_KEYS);
export type StageKey = z.infer<typeof stageKeySchema>;
export const STAGE_TITLES: Record<StageKey, string> = {
  design_basis: 'Design basis',
  column_layout: 'Column layout',
  beam_framing: 'Beam framing',
  slab_panels: 'Slab panels',
  stairs: 'Stairs',
  foundations: 'Foundations',
};

export const stageStateSchema = z.enum(['not_started', 'in_progress', 'under_review', 'returned', 'approved']);
export type StageState = z.infer<typeof stageStateSchema>;

export const stageSchema = z.object({
  key: stageKeySchema,
  title: z.string(),
  position: z.number().int(),
  state: stageStateSchema,
  assignee: personRef.nullable(),
  dueDate: isoDate.nullable(),
  /** Due date passed while the work is with the assignee (not started, in progress or returned); never while under review. */
  late: z.boolean(),
  submittedAt: z.iso.datetime().nullable(),
  approvedAt: z.iso.datetime().nullable(),
  /** Null for callers who may not see the firm's working files and review thread (clients). */
  deliverableCount: z.number().int().nullable(),
  commentCount: z.number().int().nullable(),
  /** The transitions the caller may take now (the server decides; the client only shows them). */
  allowedActions: z.array(z.enum(['start', 'submit', 'approve', 'return', 'reopen'])),
});
export type Stage = z.infer<typeof stageSchema>;

/** PATCH /api/projects/:projectId/stages/:stageKey (principal): assignment and due date. */
export const stagePatchSchema = z
  .object({ assigneeId: id.nullable().optional(), dueDate: isoDate.nullable().optional() })
  .refine((v) => Object.keys(v).length > 0, { message: 'nothing to change' });
export type StagePatch = z.input<typeof stagePatchSchema>;

/** The stages whose submission names a scheme version and answers for its error-level checks. */
export const SCHEME_STAGE_KEYS = [
  'column_layout',
  'beam_framing',
  'foundations',
] as const satisfies readonly StageKey[];
export const isSchemeStage = (key: StageKey): boolean => (SCHEME_STAGE_KEYS as readonly StageKey[]).includes(key);

/**
 * The engineer's reason why one error-level check may stand, named as the engine names the check:
 * its rule id and the elements it is about.
 */
export const checkJustificationSchema = z.object({
  ruleId: z.string().trim().min(1).max(200),
  elements: z.array(z.string().max(200)).max(100),
  text: z.string().trim().min(1, 'say why this check may stand').max(4000),
});
export type CheckJustification = z.infer<typeof checkJustificationSchema>;

/** One way to name a check in messages and field keys: "column.capacity @ B3". */
export const checkKey = (c: { ruleId: string; elements: readonly string[] }): string =>
  `${c.ruleId} @ ${c.elements.join(', ')}`;

/** POST /api/projects/:projectId/stages/:stageKey/transitions */
export const stageTransitionSchema = z.discriminatedUnion('action', [
  z.object({ action: z.literal('start') }),
  z.object({
    action: z.literal('submit'),
    comment: z.string().trim().max(4000).optional(),
    /** Column layout, Beam framing and Foundations only: the scheme, and its version (default: the latest save). */
    scheme: z.object({ schemeId: id, version: z.number().int().min(1).optional() }).optional(),
    justifications: z.array(checkJustificationSchema).max(500).optional(),
  }),
  z.object({ action: z.literal('approve'), comment: z.string().trim().max(4000).optional() }),
  z.object({ action: z.literal('return'), comment: z.string().trim().min(1, 'say what needs changing').max(4000) }),
  z.object({ action: z.literal('reopen'), reason: z.string().trim().min(1, 'give a reason for reopening').max(4000) }),
]);
export type StageTransition = z.infer<typeof stageTransitionSchema>;
export type StageAction = StageTransition['action'];

export const projectStatusFilterSchema = z.enum(['active', 'archived', 'all']);

/** GET /api/projects query: server-side sorting, filtering and paging. */
export const projectListQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
  sort: z.enum(['reference', 'name', 'client', 'updatedAt', 'storeys']).default('reference'),
  direction: z.enum(['asc', 'desc']).default('desc'),
  q: z.string().trim().max(100).optional(),
  clientOrganisationId: id.optional(),
  status: projectStatusFilterSchema.default('active'),
});
export type ProjectListQuery = z.input<typeof projectListQuerySchema>;

export const projectListItemSchema = z.object({
  id,
  reference: z.string(),
  name: z.string(),
  clientOrganisation: z.object({ id, name: z.string() }),
  siteAddress: z.string(),
  storeys: z.number().int(),
  archived: z.boolean(),
  updatedAt: z.iso.datetime(),
  /** The first stage not yet approved, or null when all are approved. */
  currentStage: z.object({ key: stageKeySchema, title: z.string(), state: stageStateSchema }).nullable(),
  lateStages: z.number().int(),
});
export type ProjectListItem = z.infer<typeof projectListItemSchema>;

export const pageOf = <T extends z.ZodType>(item: T) =>
  z.object({ items: z.array(item), total: z.number().int(), page: z.number().int(), pageSize: z.number().int() });
export const projectListSchema = pageOf(projectListItemSchema);
export type ProjectList = z.infer<typeof projectListSchema>;

/** GET /api/projects/:projectId/full — everything the project page shows. */
export const projectPageSchema = z.object({
  id,
  reference: z.string(),
  name: z.string(),
  clientOrganisation: z.object({ id, name: z.string() }),
  siteAddress: z.string(),
  buildingUse: z.string(),
  storeys: z.number().int(),
  storeyHeightM: z.number(),
  floorAreaM2: z.number().nullable(),
  /** Unit rates are the firm's own prices: left out for the project's client. */
  designBasis: projectDesignBasisSchema.nullable(),
  /** The project's currency, which the unit rates are in (money itself is under finance). */
  currency: z.string(),
  archivedAt: z.iso.datetime().nullable(),
  /** Only for those who may see money. */
  finance: z.object({ estimatedCost: z.number().nullable(), currency: z.string() }).nullable(),
  members: z.array(z.object({ id, displayName: z.string(), role: z.enum(['principal', 'engineer', 'client']) })),
  stages: z.array(stageSchema),
  abilities: projectAbilitiesSchema,
});
export type ProjectPage = z.infer<typeof projectPageSchema>;

export const commentSchema = z.object({
  id,
  stageKey: stageKeySchema,
  author: personRef,
  body: z.string(),
  /** Set when the comment came with a transition (return, approve, reopen, submit). */
  action: z.enum(['start', 'submit', 'approve', 'return', 'reopen']).nullable(),
  createdAt: z.iso.datetime(),
});
export type Comment = z.infer<typeof commentSchema>;
export const commentCreateSchema = z.object({ body: z.string().trim().min(1, 'write something first').max(4000) });
export type CommentCreate = z.input<typeof commentCreateSchema>;

/** One stored version of a deliverable file. A re-upload under the same name adds a version. */
export const deliverableSchema = z.object({
  id,
  stageKey: stageKeySchema,
  fileName: z.string(),
  version: z.number().int().min(1),
  sizeBytes: z.number().int().nonnegative(),
  sha256: z.string().regex(/^[0-9a-f]{64}$/),
  contentType: z.string(),
  uploadedBy: personRef,
  uploadedAt: z.iso.datetime(),
  /** GET this to download (streams, or redirects to a short-lived signed link). */
  downloadUrl: z.string(),
});
export type Deliverable = z.infer<typeof deliverableSchema>;

/** What an activity entry is about; fee entries are shown to the principal and the project's client only. */
export const activityObjectTypeSchema = z.enum([
  'project',
  'stage',
  'deliverable',
  'comment',
  'membership',
  'drawing',
  'revision',
  'transmittal',
  'fee_agreement',
  'invoice',
  'payment',
]);

export const activityQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(50),
  objectType: activityObjectTypeSchema.optional(),
  stageKey: stageKeySchema.optional(),
  actorId: id.optional(),
});
export type ActivityQuery = z.input<typeof activityQuerySchema>;

export const activitySchema = z.object({
  id,
  at: z.iso.datetime(),
  actor: personRef.nullable(),
  /** Dotted verb, e.g. project.created, stage.submitted, deliverable.uploaded, comment.added, membership.added. */
  action: z.string(),
  objectType: activityObjectTypeSchema,
  objectId: z.string(),
  stageKey: stageKeySchema.nullable(),
  /** One readable sentence for the log, e.g. "Tomas Ekwueme submitted Column layout for review". */
  summary: z.string(),
});
export type Activity = z.infer<typeof activitySchema>;
export const activityListSchema = pageOf(activitySchema);

/** GET /api/dev/outbox (principal; only when the local SMTP fake is configured). */
export const outboxMessageSchema = z.object({
  id: z.string(),
  receivedAt: z.iso.datetime(),
  from: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  text: z.string(),
  html: z.string().nullable(),
});
export type OutboxMessage = z.infer<typeof outboxMessageSchema>;
/** GET /api/dev/outbox?page=&pageSize=: newest first, one page at a time. */
export const outboxQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
});
export type OutboxQuery = z.infer<typeof outboxQuerySchema>;
export const outboxPageSchema = pageOf(outboxMessageSchema);
export type OutboxPage = z.infer<typeof outboxPageSchema>;
