import { z } from 'zod';
import { pageOf, stageKeySchema } from './projects';

// The drawing register: drawings, revisions, their files, transmittals and downloads.
// Revision and suitability codes follow ISO 19650 practice (or the older letters-then-numbers
// convention); the firm picks the scheme, the server proposes the next code.

const id = z.uuid();
const isoDate = z.iso.date();
const personRef = z.object({ id, displayName: z.string() });

export const SHEET_SIZES = ['A0', 'A1', 'A2', 'A3', 'A4'] as const;
export const sheetSizeSchema = z.enum(SHEET_SIZES);
export type SheetSize = z.infer<typeof sheetSizeSchema>;

export const REVISION_STATES = ['draft', 'checked', 'approved', 'issued', 'superseded'] as const;
export const revisionStateSchema = z.enum(REVISION_STATES);
export type RevisionState = z.infer<typeof revisionStateSchema>;

/** iso19650: P01, P02 … then C01, C02 …; letters_numbers: A, B … then 0, 1 …. */
export const revisionSchemeSchema = z.enum(['iso19650', 'letters_numbers']);
export type RevisionScheme = z.infer<typeof revisionSchemeSchema>;
/** Preliminary revisions are shared for coordination; contractual ones are published (authorised). */
export const revisionSeriesSchema = z.enum(['preliminary', 'contractual']);
export type RevisionSeries = z.infer<typeof revisionSeriesSchema>;

/** ISO 19650 suitability: S0–S4 while shared, A1–An once authorised for a stage, CR as constructed. */
export const suitabilitySchema = z
  .string()
  .trim()
  .toUpperCase()
  .regex(/^(S[0-4]|A[1-9][0-9]?|CR)$/, 'a suitability code: S0–S4, A1–A99 or CR');
export const SUITABILITY_MEANINGS: Record<string, string> = {
  S0: 'Work in progress',
  S1: 'Shared for coordination',
  S2: 'Shared for information',
  S3: 'Shared for review and comment',
  S4: 'Shared for review and authorisation',
  CR: 'As-constructed record',
};
/** What a suitability code means in words (A-codes name the stage they are authorised for). */
export function suitabilityMeaning(code: string): string {
  if (/^A\d+$/.test(code)) return `Authorised for stage ${code.slice(1)}`;
  return SUITABILITY_MEANINGS[code] ?? code;
}
/** Suitability codes that go with each series (ISO 19650 practice). */
export function suitabilityFitsSeries(code: string, series: RevisionSeries): boolean {
  return series === 'preliminary' ? /^S[0-4]$/.test(code) : /^(A\d+|CR)$/.test(code);
}

export const PURPOSES = [
  'information',
  'comment',
  'coordination',
  'approval',
  'tender',
  'construction',
  'record',
] as const;
export const purposeSchema = z.enum(PURPOSES);
export type Purpose = z.infer<typeof purposeSchema>;
export const PURPOSE_LABELS: Record<Purpose, string> = {
  information: 'For information',
  comment: 'For comment',
  coordination: 'For coordination',
  approval: 'For approval',
  tender: 'For tender',
  construction: 'For construction',
  record: 'As-constructed record',
};

export const drawingNumberSchema = z
  .string()
  .trim()
  .min(1)
  .max(60)
  .regex(/^[A-Za-z0-9][A-Za-z0-9._-]*$/, 'letters, digits and . _ - only, starting with a letter or digit');

/** The firm's numbering pattern: literal text with {project} and one {seq:N} (N digits). */
export const numberPatternSchema = z
  .string()
  .trim()
  .min(1)
  .max(80)
  .refine((p) => (p.match(/\{seq:[1-6]\}/g) ?? []).length === 1, 'exactly one {seq:N} with N from 1 to 6')
  .refine(
    (p) => /^[A-Za-z0-9._-]*$/.test(p.replace(/\{seq:[1-6]\}|\{project\}/g, '')),
    'besides {project} and {seq:N}, only letters, digits and . _ -',
  );

export const drawingSettingsSchema = z.object({
  revisionScheme: revisionSchemeSchema,
  numberPattern: numberPatternSchema,
});
export type DrawingSettings = z.infer<typeof drawingSettingsSchema>;

/** POST /api/projects/:projectId/drawings */
export const drawingCreateSchema = z.object({
  number: drawingNumberSchema,
  title: z.string().trim().min(1).max(200),
  stageKey: stageKeySchema,
  sheetSize: sheetSizeSchema,
  scale: z
    .string()
    .trim()
    .regex(/^(1:\d{1,5}|NTS|As shown)$/, 'a scale such as 1:100, or NTS, or As shown'),
});
export type DrawingCreate = z.input<typeof drawingCreateSchema>;

/** POST /api/projects/:projectId/drawings/:drawingId/revisions */
export const revisionCreateSchema = z.object({
  /** Omitted: the series of the drawing's latest revision (preliminary for the first). */
  series: revisionSeriesSchema.optional(),
  suitability: suitabilitySchema,
  purpose: purposeSchema,
  description: z.string().trim().max(2000).default(''),
  date: isoDate,
});
export type RevisionCreate = z.input<typeof revisionCreateSchema>;

/** PATCH /api/projects/:projectId/revisions/:revisionId (a draft only). */
export const revisionPatchSchema = z
  .object({
    suitability: suitabilitySchema,
    purpose: purposeSchema,
    description: z.string().trim().max(2000),
    date: isoDate,
  })
  .partial()
  .refine((v) => Object.keys(v).length > 0, { message: 'nothing to change' });
export type RevisionPatch = z.input<typeof revisionPatchSchema>;

export const revisionActionSchema = z.enum(['check', 'approve']);
export type RevisionAction = z.infer<typeof revisionActionSchema>;
export const revisionTransitionSchema = z.object({ action: revisionActionSchema });

export const revisionFileSchema = z.object({
  id,
  role: z.enum(['pdf', 'source']),
  fileName: z.string(),
  sizeBytes: z.number().int().nonnegative(),
  sha256: z.string().regex(/^[0-9a-f]{64}$/),
  contentType: z.string(),
  uploadedAt: z.iso.datetime(),
  downloadUrl: z.string(),
});
export type RevisionFile = z.infer<typeof revisionFileSchema>;

export const revisionSchema = z.object({
  id,
  drawingId: id,
  code: z.string(),
  series: revisionSeriesSchema,
  suitability: z.string(),
  purpose: purposeSchema,
  description: z.string(),
  date: isoDate,
  state: revisionStateSchema,
  drawnBy: personRef,
  checkedBy: personRef.nullable(),
  approvedBy: personRef.nullable(),
  issuedAt: z.iso.datetime().nullable(),
  /**
   * The scheme version a plan sheet revision was drawn from (null for a revision uploaded by
   * hand, and always null for client contacts: schemes are the firm's own work).
   */
  fromScheme: z.object({ id, name: z.string(), version: z.number().int().min(1) }).nullable(),
  files: z.array(revisionFileSchema),
  /** What the caller may do to it now (the server decides; the client only shows them). */
  allowedActions: z.array(revisionActionSchema),
});
export type Revision = z.infer<typeof revisionSchema>;

/** The revision a register row shows: the newest the caller may see. */
export const revisionSummarySchema = z.object({
  id,
  code: z.string(),
  suitability: z.string(),
  state: revisionStateSchema,
  date: isoDate,
  issuedAt: z.iso.datetime().nullable(),
});

export const drawingListItemSchema = z.object({
  id,
  number: z.string(),
  title: z.string(),
  stageKey: stageKeySchema,
  sheetSize: sheetSizeSchema,
  scale: z.string(),
  current: revisionSummarySchema.nullable(),
  revisionCount: z.number().int(),
});
export type DrawingListItem = z.infer<typeof drawingListItemSchema>;
export const drawingListSchema = pageOf(drawingListItemSchema);
export type DrawingList = z.infer<typeof drawingListSchema>;

export const drawingSchema = drawingListItemSchema.extend({
  /** Newest first. Client contacts get only issued and superseded ones. */
  revisions: z.array(revisionSchema),
  /** Empty when a revision is open, or for someone who may not register one. */
  canRegisterRevision: z.boolean(),
});
export type Drawing = z.infer<typeof drawingSchema>;

/** GET /api/projects/:projectId/drawings (and the exports). */
export const drawingListQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
  sort: z.enum(['number', 'title', 'stage', 'revision', 'date']).default('number'),
  direction: z.enum(['asc', 'desc']).default('asc'),
  q: z.string().trim().max(100).optional(),
  stageKey: stageKeySchema.optional(),
  state: revisionStateSchema.optional(),
  suitability: z.string().trim().toUpperCase().max(3).optional(),
});
export type DrawingListQuery = z.input<typeof drawingListQuerySchema>;

export const nextNumberSchema = z.object({ number: z.string(), pattern: z.string() });
export const nextRevisionQuerySchema = z.object({ series: revisionSeriesSchema.optional() });
export const nextRevisionSchema = z.object({
  code: z.string(),
  series: revisionSeriesSchema,
  scheme: revisionSchemeSchema,
});

// ---- Transmittals ----

export const transmittalCreateSchema = z.object({
  purpose: purposeSchema,
  note: z.string().trim().max(4000).default(''),
  revisionIds: z.array(id).min(1, 'choose at least one approved revision').max(500),
  /** Client contacts with accounts, by user id. */
  contactIds: z.array(id).max(50).default([]),
  /** Outside addresses (a contractor, say); they get signed links that expire. */
  externalEmails: z.array(z.email().max(254)).max(50).default([]),
});
export type TransmittalCreate = z.input<typeof transmittalCreateSchema>;

export const transmittalRecipientSchema = z.object({
  id,
  email: z.string(),
  name: z.string(),
  /** Null for an outside address. */
  userId: id.nullable(),
  acknowledgedAt: z.iso.datetime().nullable(),
});

export const transmittalItemSchema = z.object({
  revisionId: id,
  drawingId: id,
  number: z.string(),
  title: z.string(),
  code: z.string(),
  suitability: z.string(),
  purpose: purposeSchema,
  date: isoDate,
  state: revisionStateSchema,
  files: z.array(revisionFileSchema),
});

export const transmittalSchema = z.object({
  id,
  number: z.number().int(),
  reference: z.string(),
  purpose: purposeSchema,
  note: z.string(),
  issuedBy: personRef,
  issuedAt: z.iso.datetime(),
  linksExpireAt: z.iso.datetime(),
  items: z.array(transmittalItemSchema),
  recipients: z.array(transmittalRecipientSchema),
  sheetUrl: z.string(),
  zipUrl: z.string(),
  /** Set for a client contact who received it; null otherwise. */
  myAcknowledgement: z.object({ acknowledgedAt: z.iso.datetime().nullable() }).nullable(),
});
export type Transmittal = z.infer<typeof transmittalSchema>;

export const transmittalListItemSchema = transmittalSchema
  .pick({
    id: true,
    number: true,
    reference: true,
    purpose: true,
    issuedAt: true,
    myAcknowledgement: true,
  })
  .extend({ itemCount: z.number().int(), recipientCount: z.number().int(), acknowledgedCount: z.number().int() });
export type TransmittalListItem = z.infer<typeof transmittalListItemSchema>;
export const transmittalListSchema = z.array(transmittalListItemSchema);

export const downloadLogEntrySchema = z.object({
  id,
  at: z.iso.datetime(),
  what: z.enum(['file', 'zip', 'sheet']),
  fileName: z.string().nullable(),
  /** A signed-in person, or the outside address whose link was used. */
  who: z.string(),
  viaLink: z.boolean(),
  ip: z.string().nullable(),
});
export type DownloadLogEntry = z.infer<typeof downloadLogEntrySchema>;
export const downloadLogSchema = z.array(downloadLogEntrySchema);

/** Query of a signed link for an outside recipient: who, until when, and the HMAC over both. */
export const signedLinkQuerySchema = z.object({
  r: z.string().max(64),
  e: z.string().max(16),
  s: z.string().max(128),
});
