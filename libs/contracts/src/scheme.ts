// The structural scheme document: one layout of one building, versioned. The server validates
// with this schema before storing a scheme; the engine (@trabeate/structural) then runs its own
// engineering validation and names any problem by element and field.
// Units: SI. Plan coordinates and lengths in m; sections in mm (fields ending Mm); loads kN,
// kN/m, kPa; strengths MPa.
import { z } from 'zod';

const positive = z.number().positive();
const nonNegative = z.number().nonnegative();

export const codeFamilySchema = z.enum(['IS456', 'ACI318', 'EN1992']);
export type CodeFamilyValue = z.infer<typeof codeFamilySchema>;

export const unitRatesSchema = z.object({
  currency: z.string().min(1).max(8),
  concretePerM3: nonNegative,
  steelPerKg: nonNegative,
  formworkPerM2: nonNegative,
});

export const designBasisSchema = z.object({
  codeFamily: codeFamilySchema,
  concreteMPa: z.number().min(10).max(120),
  steelMPa: z.number().min(200).max(700),
  imposedKPa: nonNegative,
  roofImposedKPa: nonNegative.optional(),
  superimposedDeadKPa: nonNegative,
  wallLoadKNPerM: nonNegative,
  bearingPressureKPa: positive,
  foundingDepthM: nonNegative,
  storeys: z.number().int().min(1).max(200),
  storeyHeightM: positive,
  slabThicknessMm: positive.optional(),
  /** EN 1992-1-1 §3.1.6(1) αcc; recommended 1.0 (the engine's default), a national annex may choose 0.8 to 1.0 */
  alphaCc: z.number().min(0.8).max(1).optional(),
  beamWidthMm: positive,
  rates: unitRatesSchema,
  limitOverrides: z.record(z.string(), nonNegative).optional(),
});

export const pointSchema = z.object({ x: z.number(), y: z.number() });

export const plotBoundarySchema = z
  .object({
    vertices: z.array(pointSchema).min(3),
    propertyLines: z.array(z.number().int().nonnegative()),
  })
  .refine((b) => b.propertyLines.every((k) => k < b.vertices.length), {
    message: 'a property line index is beyond the last segment',
    path: ['propertyLines'],
  });

export const gridLineSchema = z
  .object({
    id: z.string().min(1),
    label: z.string().min(1),
    x: z.number().optional(),
    y: z.number().optional(),
    overhangStartM: nonNegative.optional(),
    overhangEndM: nonNegative.optional(),
    wallThicknessMm: nonNegative.optional(),
    beamWidthMm: positive.optional(),
    beamDepthMm: positive.optional(),
  })
  .refine((g) => (g.x === undefined) !== (g.y === undefined), {
    message: 'a grid line sets exactly one of x or y',
    path: ['x'],
  });

export const columnSchema = z.object({
  id: z.string().min(1),
  label: z.string().min(1),
  x: z.number(),
  y: z.number(),
  widthMm: positive,
  depthMm: positive,
  orientationDeg: z.union([z.literal(0), z.literal(90)]),
});

export const secondaryBeamSchema = z.object({
  id: z.string().min(1),
  start: pointSchema,
  end: pointSchema,
  widthMm: positive.optional(),
  depthMm: positive.optional(),
  carriesWall: z.boolean().optional(),
});

export const stairFlightSchema = z.object({
  id: z.string().min(1),
  riserMm: positive,
  treadMm: positive,
  risers: z.number().int().min(1),
  widthM: positive,
  use: z.enum(['residential', 'other']),
});

/** The footing options the engine sizes where a column's own pad would cross a property line or overlap another. */
export const footingOptionSchema = z.enum([
  'shift',
  'strap',
  'combinedRectangular',
  'combinedTrapezoidal',
  'combinedOverlap',
  'isolated',
]);
export type FootingOption = z.infer<typeof footingOptionSchema>;

/** The engineer's choice for one column, with the reason in their words (one entry per column at most). */
export const footingChoiceSchema = z.object({
  columnId: z.string().min(1),
  option: footingOptionSchema,
  reason: z.string().trim().min(1).max(2000),
});
export type FootingChoice = z.infer<typeof footingChoiceSchema>;

const uniqueIds = (list: readonly { id: string }[]) => new Set(list.map((e) => e.id)).size === list.length;

export const schemeSchema = z
  .object({
    schemaVersion: z.literal(2),
    id: z.string().min(1),
    name: z.string().min(1).max(200),
    basis: designBasisSchema,
    boundary: plotBoundarySchema,
    grid: z.array(gridLineSchema),
    columns: z.array(columnSchema),
    secondaryBeams: z.array(secondaryBeamSchema),
    stairs: z.array(stairFlightSchema),
    footingChoices: z.array(footingChoiceSchema).default([]),
  })
  .superRefine((s, ctx) => {
    for (const key of ['grid', 'columns', 'secondaryBeams', 'stairs'] as const) {
      if (!uniqueIds(s[key])) ctx.addIssue({ code: 'custom', message: `ids in ${key} must be unique`, path: [key] });
    }
    const chosen = s.footingChoices.map((c) => c.columnId);
    if (new Set(chosen).size !== chosen.length)
      ctx.addIssue({ code: 'custom', message: 'one footing choice per column at most', path: ['footingChoices'] });
  });

export type SchemeDocument = z.infer<typeof schemeSchema>;
/** A document as sent: footingChoices may be left out (it defaults to none). */
export type SchemeDocumentInput = z.input<typeof schemeSchema>;
