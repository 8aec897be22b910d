import type { Knex } from 'knex';
import { schemeResultsSchema, schemeSchema, type SchemeDocument } from '@trabeate/contracts';
import { demoScheme, demoSchemeVariant, type Scheme } from '@trabeate/structural';
import { insertNewScheme } from '../apps/server/src/schemes/schemes.service';
import { summariseChecks } from '../apps/server/src/stages/stage-submissions';
import { DEMO, DEMO_RATES } from './demo-data';

// Kestrel Yard's two schemes: the engine's invented demo building, turned to sit on Kestrel
// Yard's plot (neighbours on the north and east) and priced in the project's currency. Scheme A
// has the full grid; scheme B leaves out one interior column, so two beam lines span two bays.

export const DEMO_SCHEMES = {
  full: { id: '0b8c2d1e-0000-4000-8000-000000000401', name: 'Scheme A: full grid' },
  fewer: { id: '0b8c2d1e-0000-4000-8000-000000000402', name: 'Scheme B: one column fewer (C3 left out)' },
} as const;

/**
 * Turns a scheme half a turn about the centre of its plot, so property lines on the south and
 * west become the north and east, and relabels the grid so letters still run west to east and
 * numbers south to north.
 */
export function turnedHalf(s: Scheme): Scheme {
  const xs = s.boundary.vertices.map((v) => v.x);
  const ys = s.boundary.vertices.map((v) => v.y);
  const cx = Math.min(...xs) + Math.max(...xs);
  const cy = Math.min(...ys) + Math.max(...ys);
  const round = (v: number) => Math.round(v * 1000) / 1000;
  const p = (q: { x: number; y: number }) => ({ x: round(cx - q.x), y: round(cy - q.y) });
  const n = s.boundary.vertices.length;
  // vertex i goes to where vertex i was turned; segments keep their index
  const vertices = s.boundary.vertices.map(p);
  const alongX = s.grid.filter((g) => g.x !== undefined).sort((a, b) => (b.x as number) - (a.x as number));
  const alongY = s.grid.filter((g) => g.y !== undefined).sort((a, b) => (b.y as number) - (a.y as number));
  const xLabel = new Map(
    alongX.map((g, i) => [
      g.id,
      s.grid
        .filter((h) => h.x !== undefined)
        .map((h) => h.label)
        .sort()[i],
    ]),
  );
  const yLabel = new Map(
    alongY.map((g, i) => [
      g.id,
      s.grid
        .filter((h) => h.y !== undefined)
        .map((h) => h.label)
        .sort((a, b) => Number(a) - Number(b))[i],
    ]),
  );
  const label = (id: string) => (xLabel.get(id) ?? yLabel.get(id)) as string;
  const grid = s.grid.map((g) => {
    const { overhangStartM, overhangEndM, ...rest } = g;
    return {
      ...rest,
      id: label(g.id),
      label: label(g.id),
      ...(g.x !== undefined ? { x: round(cx - g.x) } : { y: round(cy - (g.y as number)) }),
      // the line now runs the other way: what overhung its end overhangs its start
      ...(overhangEndM !== undefined ? { overhangStartM: overhangEndM } : {}),
      ...(overhangStartM !== undefined ? { overhangEndM: overhangStartM } : {}),
    };
  });
  const xAt = new Map(grid.filter((g) => g.x !== undefined).map((g) => [g.x as number, g.label]));
  const yAt = new Map(grid.filter((g) => g.y !== undefined).map((g) => [g.y as number, g.label]));
  const columns = s.columns.map((c) => {
    const at = p(c);
    const name = `${xAt.get(at.x) ?? ''}${yAt.get(at.y) ?? ''}` || c.label;
    return { ...c, ...at, id: name, label: name };
  });
  return {
    ...s,
    boundary: { vertices, propertyLines: s.boundary.propertyLines.map((k) => k % n) },
    grid,
    columns,
    secondaryBeams: s.secondaryBeams.map((b) => ({ ...b, start: p(b.end), end: p(b.start) })),
  };
}

/**
 * Scheme A's one recorded footing choice: D4 stands 0.2 m from the east property line, so its own
 * pad would cross it. The reason is invented for the demo.
 */
export const DEMO_FOOTING_CHOICE: SchemeDocument['footingChoices'][number] = {
  columnId: 'D4',
  option: 'strap',
  reason:
    'Strap to C4: the survey of the neighbouring wall footing is not in yet, and a strap keeps the east pad clear of the line without moving D4 or shortening the bay.',
};

interface DemoBasis {
  codeFamily: string;
  concreteMPa: number;
  bearingPressureKPa: number;
  rates?: { concretePerM3: number; steelPerKg: number; formworkPerM2: number };
}

/**
 * The two demo schemes as stored documents: the project's basis, storey height, currency and unit
 * rates (Kestrel Yard's invented demo rates where the basis has none).
 */
export function kestrelSchemes(basis: DemoBasis, currency = 'EUR') {
  const { rates = DEMO_RATES.kestrel, ...rest } = basis;
  const dress = (s: Scheme): SchemeDocument =>
    schemeSchema.parse({
      ...turnedHalf(s),
      basis: { ...s.basis, ...rest, storeyHeightM: 3.1, rates: { currency, ...rates } },
    });
  const full = dress(demoScheme());
  return { full: { ...full, footingChoices: [DEMO_FOOTING_CHOICE] }, fewer: dress(demoSchemeVariant()) };
}

/** Adds Kestrel Yard's two schemes once (by their fixed ids); safe to run again. */
export async function seedDemoSchemes(db: Knex): Promise<void> {
  const project = await db('projects').where({ id: DEMO.projects.kestrel.id }).first('design_basis', 'currency');
  if (!project) return;
  const basis = project.design_basis as DemoBasis;
  const docs = kestrelSchemes(
    {
      codeFamily: basis.codeFamily,
      concreteMPa: basis.concreteMPa,
      bearingPressureKPa: basis.bearingPressureKPa,
      rates: basis.rates,
    },
    String(project.currency).trim(),
  );
  for (const key of ['full', 'fewer'] as const) {
    const fixed = DEMO_SCHEMES[key];
    if (await db('schemes').where({ id: fixed.id }).first('id')) continue;
    await db.transaction(async (trx) => {
      await insertNewScheme(trx, {
        id: fixed.id,
        firmId: DEMO.firm.id,
        projectId: DEMO.projects.kestrel.id,
        name: fixed.name,
        authorId: DEMO.users.engineerA.id,
        document: () => docs[key],
      });
    });
  }
}

/**
 * Kestrel Yard's Column layout waits for review resting on scheme A's first save: the submission
 * row carries that save's stored check summary (no error-level checks, so nothing to justify).
 * Added once, while the stage is still under review with no submission recorded; safe to run again.
 */
export async function seedDemoSubmission(db: Knex): Promise<void> {
  const projectId = DEMO.projects.kestrel.id;
  const stage = await db('stages')
    .where({ project_id: projectId, key: 'column_layout' })
    .first('state', 'submitted_at');
  if (stage?.state !== 'under_review') return;
  if (await db('stage_submissions').where({ project_id: projectId, stage_key: 'column_layout' }).first('id')) return;
  const saved = await db('scheme_versions')
    .where({ scheme_id: DEMO_SCHEMES.full.id, version: 1 })
    .first('results', 'engine_version');
  if (!saved) return;
  const summary = summariseChecks(schemeResultsSchema.parse(saved.results), saved.engine_version);
  if (summary.errors > 0) return; // the demo's story has nothing to justify here
  const comment = await db('stage_comments')
    .where({ project_id: projectId, stage_key: 'column_layout', action: 'submit' })
    .first('body');
  await db('stage_submissions').insert({
    firm_id: DEMO.firm.id,
    project_id: projectId,
    stage_key: 'column_layout',
    submitted_by: DEMO.users.engineerA.id,
    submitted_at: stage.submitted_at ?? db.fn.now(),
    comment: comment?.body ?? null,
    scheme_id: DEMO_SCHEMES.full.id,
    scheme_version: 1,
    check_summary: JSON.stringify(summary),
    justifications: JSON.stringify([]),
  });
}
