// The structural scheme document: one layout of one building, versioned. The server validates
// with this schema before storing a scheme; the engine (@trabeate/structural) then runs its own
// engineering validation and names any problem by element and field.
// Units: SI. Plan coordinates and lengths in m; sections in mm (fields ending Mm); loads kN,
// kN/m, kPa; strengths MPa.
import { z } from 'zod';

const positive = z.number().positive();
const nonNegative = z.number().nonnegative();

/**
 * The engine's bounds (SCHEME_LIMITS and the ranges in @trabeate/structural's validateScheme),
 * repeated here because contracts import nothing from the engine; scheme.spec.ts checks that
 * both refuse the same values. Beyond them a scheme is not a building the engine plans.
 */
export const SCHEME_DOCUMENT_LIMITS = {
  loadKPa: 50,
  coordM: 5000,
  gridLines: 2000,
  columns: 10000,
  secondaryBeams: 10000,
  stairs: 200,
  vertices: 1000,
} as const;
const LIM = SCHEME_DOCUMENT_LIMITS;
const coord = z.number().min(-LIM.coordM).max(LIM.coordM);

export const codeFamilySchema = z.enum(['IS456', 'ACI318', 'EN1992']);
export type CodeFamilyValue = z.infer<typeof codeFamilySchema>;

export const unitRatesSchema = z.object({
  currency: z.string().min(1).max(8),
  concretePerM3: nonNegative.max(1e9),
  steelPerKg: nonNegative.max(1e9),
  formworkPerM2: nonNegative.max(1e9),
});

export const designBasisSchema = z.object({
  codeFamily: codeFamilySchema,
  concreteMPa: z.number().min(10).max(120),
  steelMPa: z.number().min(200).max(700),
  imposedKPa: nonNegative.max(LIM.loadKPa),
  roofImposedKPa: nonNegative.max(LIM.loadKPa).optional(),
  superimposedDeadKPa: nonNegative.max(LIM.loadKPa),
  wallLoadKNPerM: nonNegative.max(200),
  bearingPressureKPa: positive.max(10000),
  foundingDepthM: nonNegative.max(50),
  storeys: z.number().int().min(1).max(200),
  storeyHeightM: positive.max(20),
  slabThicknessMm: positive.max(1500).optional(),
  /** EN 1992-1-1 §3.1.6(1) αcc; recommended 1.0 (the engine's default), a national annex may choose 0.8 to 1.0 */
  alphaCc: z.number().min(0.8).max(1).optional(),
  beamWidthMm: positive.max(3000),
  rates: unitRatesSchema,
  limitOverrides: z.record(z.string(), nonNegative.max(1e6)).optional(),
});

export const pointSchema = z.object({ x: coord, y: coord });

export const plotBoundarySchema = z
  .object({
    vertices: z.array(pointSchema).min(3).max(LIM.vertices),
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
    x: coord.optional(),
    y: coord.optional(),
    overhangStartM: nonNegative.max(10).optional(),
    overhangEndM: nonNegative.max(10).optional(),
    wallThicknessMm: nonNegative.max(1000).optional(),
    beamWidthMm: positive.max(3000).optional(),
    beamDepthMm: positive.max(5000).optional(),
  })
  .refine((g) => (g.x === undefined) !== (g.y === undefined), {
    message: 'a grid line sets exactly one of x or y',
    path: ['x'],
  });

export const columnSchema = z.object({
  id: z.string().min(1),
  label: z.string().min(1),
  x: coord,
  y: coord,
  // the engine's smallest section side (libs/structural validateScheme): 100 mm
  widthMm: z.number().min(100).max(5000),
  depthMm: z.number().min(100).max(5000),
  orientationDeg: z.union([z.literal(0), z.literal(90)]),
});

export const secondaryBeamSchema = z.object({
  id: z.string().min(1),
  start: pointSchema,
  end: pointSchema,
  widthMm: z.number().min(100).max(3000).optional(),
  depthMm: z.number().min(100).max(5000).optional(),
  carriesWall: z.boolean().optional(),
});

export const stairFlightSchema = z.object({
  id: z.string().min(1),
  // the engine's input bounds (validateScheme), so a form held to these never sends what it refuses
  riserMm: z.number().min(50).max(400),
  treadMm: z.number().min(100).max(1000),
  risers: z.number().int().min(1).max(100),
  widthM: z.number().min(0.5).max(20),
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

/** Words for each footing option: the planning panel, its list and the calculation report. */
export const FOOTING_OPTION_LABELS: Readonly<Record<z.infer<typeof footingOptionSchema>, string>> = {
  shift: 'Move the column inward',
  strap: 'Strap to an interior column',
  combinedRectangular: 'Combined footing, rectangular',
  combinedTrapezoidal: 'Combined footing, trapezoidal',
  combinedOverlap: 'Combined footing for both columns',
  isolated: 'Keep separate pads',
};

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
    grid: z.array(gridLineSchema).max(LIM.gridLines),
    columns: z.array(columnSchema).max(LIM.columns),
    secondaryBeams: z.array(secondaryBeamSchema).max(LIM.secondaryBeams),
    stairs: z.array(stairFlightSchema).max(LIM.stairs),
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
