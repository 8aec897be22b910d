import { z } from 'zod';
import { purposeSchema, revisionSchema, SHEET_SIZES, suitabilitySchema } from './drawings';
import { stageKeySchema } from './projects';

// Outputs of one saved scheme version: the calculation report (a PDF made by a queued job) and
// the plan sheet of its column layout (PDF for the register, SVG for the screen).

const id = z.uuid();

/** ISO 216 sizes a plan sheet is drawn on, always landscape. */
export const planSheetSizeSchema = z.enum(SHEET_SIZES);
export type PlanSheetSize = z.infer<typeof planSheetSizeSchema>;

/** Scales offered for a plan sheet, as the n of 1:n. */
export const PLAN_SCALES = [20, 50, 100, 200, 250, 500] as const;
export const planScaleSchema = z.coerce
  .number()
  .int()
  .refine((n) => (PLAN_SCALES as readonly number[]).includes(n), {
    message: `a scale of ${PLAN_SCALES.map((n) => `1:${n}`).join(', ')}`,
  });

/** Query of GET …/versions/:version/sheet.pdf and sheet.svg. */
export const planSheetQuerySchema = z.object({
  size: planSheetSizeSchema.default('A3'),
  scale: planScaleSchema.default(100),
});
export type PlanSheetQuery = z.input<typeof planSheetQuerySchema>;

/** POST …/versions/:version/reports — a new report; with `stageKey` it is also filed on that stage. */
export const schemeReportCreateSchema = z.object({ stageKey: stageKeySchema.optional() });
export type SchemeReportCreate = z.input<typeof schemeReportCreateSchema>;

export const schemeReportStateSchema = z.enum(['queued', 'running', 'done', 'failed']);
export type SchemeReportState = z.infer<typeof schemeReportStateSchema>;

/** A report's status (POST answers it with 202; GET polls it). */
export const schemeReportSchema = z.object({
  id,
  projectId: id,
  schemeId: id,
  version: z.number().int().min(1),
  state: schemeReportStateSchema,
  /** Sections written so far, of the report's total. */
  progress: z.object({ done: z.number().int().nonnegative(), total: z.number().int().nonnegative() }),
  stageKey: stageKeySchema.nullable(),
  deliverableId: id.nullable(),
  pages: z.number().int().positive().nullable(),
  sizeBytes: z.number().int().nonnegative().nullable(),
  /** Why the job failed, in words for the person who asked. */
  failure: z.string().nullable(),
  requestedAt: z.iso.datetime(),
  finishedAt: z.iso.datetime().nullable(),
});
export type SchemeReport = z.infer<typeof schemeReportSchema>;

/**
 * POST …/versions/:version/sheet/revisions — the plan sheet as a new draft revision of a drawing:
 * of `drawingId`, or of a new drawing with `newDrawing` (its number is the register's next).
 */
export const planSheetRegisterSchema = z
  .object({
    size: planSheetSizeSchema,
    scale: planScaleSchema,
    drawingId: id.optional(),
    newDrawing: z.object({ title: z.string().trim().min(1).max(200), stageKey: stageKeySchema }).optional(),
    suitability: suitabilitySchema.default('S2'),
    purpose: purposeSchema.default('information'),
    description: z.string().trim().max(2000).default(''),
  })
  .refine((b) => (b.drawingId === undefined) !== (b.newDrawing === undefined), {
    message: 'name either drawingId or newDrawing',
    path: ['drawingId'],
  });
export type PlanSheetRegister = z.input<typeof planSheetRegisterSchema>;

export const planSheetRegisteredSchema = z.object({
  drawingId: id,
  drawingNumber: z.string(),
  schemeId: id,
  version: z.number().int().min(1),
  revision: revisionSchema,
});
export type PlanSheetRegistered = z.infer<typeof planSheetRegisteredSchema>;
