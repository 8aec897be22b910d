import { z } from 'zod';
import { checkJustificationSchema, stageKeySchema } from './projects';
import { checkSeveritySchema, sourceKindSchema } from './schemes';
import { currencySchema, invoiceStateSchema } from './fees';

// What a stage's review reads: each submission of the stage, with the scheme version it rests on,
// the check summary the server stored for that version and the engineer's justifications.

const id = z.uuid();
const personRef = z.object({ id, displayName: z.string() });

/** One failing check at the submitted version (errors and warnings; information notes are left out). */
export const submittedCheckSchema = z.object({
  ruleId: z.string(),
  severity: checkSeveritySchema.exclude(['info']),
  elements: z.array(z.string()),
  message: z.string(),
  source: z.string(),
  sourceKind: sourceKindSchema,
});
export type SubmittedCheck = z.infer<typeof submittedCheckSchema>;

/** The stored results of one scheme version, summed up as they stood when the stage was submitted. */
export const checkSummarySchema = z.object({
  engineVersion: z.string(),
  errors: z.number().int().nonnegative(),
  warnings: z.number().int().nonnegative(),
  /** Failing errors and warnings counted per rule, errors first. */
  rules: z.array(
    z.object({
      ruleId: z.string(),
      errors: z.number().int().nonnegative(),
      warnings: z.number().int().nonnegative(),
    }),
  ),
  failing: z.array(submittedCheckSchema),
});
export type CheckSummary = z.infer<typeof checkSummarySchema>;

export const stageSubmissionSchema = z.object({
  id,
  stageKey: stageKeySchema,
  submittedAt: z.iso.datetime(),
  submittedBy: personRef,
  comment: z.string().nullable(),
  /** Null for stages that do not rest on a scheme (and for submissions made before they did). */
  scheme: z
    .object({
      id,
      name: z.string(),
      version: z.number().int().min(1),
      /** The scheme's latest save now; newer than `version` means it changed since submission. */
      currentVersion: z.number().int().min(1),
      changedSinceSubmitted: z.boolean(),
      /** The newest calculation report already written for the submitted version, if any. */
      report: z
        .object({
          id,
          pages: z.number().int().positive().nullable(),
          finishedAt: z.iso.datetime(),
          /** GET it for the PDF */
          fileUrl: z.string(),
        })
        .nullable(),
    })
    .nullable(),
  checks: checkSummarySchema.nullable(),
  justifications: z.array(checkJustificationSchema),
  decision: z
    .object({
      outcome: z.enum(['approved', 'returned']),
      by: personRef,
      at: z.iso.datetime(),
      comment: z.string().nullable(),
      /** The draft invoice approval offered for the stage's fee share, while it exists. */
      offeredInvoice: z
        .object({
          id,
          number: z.string().nullable(),
          state: invoiceStateSchema,
          totalMinor: z.number().int(),
          currency: currencySchema,
        })
        .nullable(),
    })
    .nullable(),
});
export type StageSubmission = z.infer<typeof stageSubmissionSchema>;

/** GET /api/projects/:projectId/stages/:stageKey/submissions — newest first. */
export const stageSubmissionListSchema = z.object({ items: z.array(stageSubmissionSchema) });
export type StageSubmissionList = z.infer<typeof stageSubmissionListSchema>;
