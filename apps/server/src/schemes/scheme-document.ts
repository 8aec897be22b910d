import {
  SCHEME_SCHEMA_VERSION,
  schemeSchema,
  type ProjectDesignBasis,
  type SchemeDocument,
  type SchemeResults,
} from '@trabeate/contracts';
import { analyseScheme, ENGINE_VERSION, type Scheme } from '@trabeate/structural';
import { HttpError } from '../core/errors';

// The scheme document on its way in and out of storage: upgrading documents written under an
// older schema version, the starting document of a new scheme, and the server's engine run.

/** One step of the upgrade path: turns a document of version n into one of version n + 1. */
export type DocumentUpgrade = (doc: Record<string, unknown>) => Record<string, unknown>;

/**
 * Upgrades keyed by the version they start from. A change to the document's shape adds its step
 * here and raises SCHEME_SCHEMA_VERSION in the contracts.
 * 1 → 2: footing choices at property lines (none recorded in a version 1 document).
 */
export const UPGRADES: Readonly<Record<number, DocumentUpgrade>> = {
  1: (d) => ({ ...d, footingChoices: Array.isArray(d['footingChoices']) ? d['footingChoices'] : [] }),
};

/**
 * Brings a raw document up to `latest` through `upgrades`, one version at a time. Refuses a
 * document without a version, one newer than this build reads, or one with a gap in the path.
 */
export function upgradeDocument(
  raw: unknown,
  upgrades: Readonly<Record<number, DocumentUpgrade>> = UPGRADES,
  latest: number = SCHEME_SCHEMA_VERSION,
): Record<string, unknown> {
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw))
    throw invalid('The scheme document must be a JSON object.');
  let doc = raw as Record<string, unknown>;
  let version = doc['schemaVersion'];
  if (typeof version !== 'number' || !Number.isInteger(version) || version < 1)
    throw invalid('The scheme document has no schemaVersion (a whole number from 1).');
  if (version > latest)
    throw invalid(
      `This scheme document is of version ${version}, newer than this server reads (up to ${latest}). Update Trabeate before saving it.`,
    );
  while (version < latest) {
    const step = upgrades[version];
    if (!step) throw new Error(`no upgrade from scheme document version ${version}`);
    doc = { ...step(doc), schemaVersion: version + 1 };
    version++;
  }
  return doc;
}

const invalid = (message: string, fields?: Record<string, string[]>) =>
  new HttpError(400, 'validation_failed', message, fields);

/** Upgrades and checks a document sent by a client; a 400 names every field that is wrong. */
export function readDocument(raw: unknown, at = 'body.document'): SchemeDocument {
  const parsed = schemeSchema.safeParse(upgradeDocument(raw));
  if (parsed.success) return parsed.data;
  const fields: Record<string, string[]> = {};
  for (const issue of parsed.error.issues)
    (fields[[at, ...issue.path.map(String)].join('.')] ??= []).push(issue.message);
  const [first] = Object.keys(fields);
  throw invalid(`Invalid ${first}: ${fields[first][0]}`, fields);
}

/** A stored document, upgraded to the current version (stored documents passed readDocument once). */
export function storedDocument(raw: unknown): SchemeDocument {
  return schemeSchema.parse(upgradeDocument(raw));
}

/** The document as the server keeps it: its id and name are the scheme's, whatever was sent. */
export const withIdentity = (doc: SchemeDocument, id: string, name: string): SchemeDocument => ({ ...doc, id, name });

export interface Analysis {
  results: SchemeResults;
  engineVersion: string;
  ok: boolean;
  /** failed checks of severity error, plus input problems the engine could not analyse past */
  errors: number;
  warnings: number;
}

/** Runs the engine as the client does, for the results stored with a save. */
export function analyse(doc: SchemeDocument): Analysis {
  const results = analyseScheme(doc as Scheme);
  const failed = results.checks.filter((c) => c.status === 'fail');
  return {
    results: results as unknown as SchemeResults,
    engineVersion: ENGINE_VERSION,
    ok: results.ok,
    errors: failed.filter((c) => c.severity === 'error').length + results.problems.length,
    warnings: failed.filter((c) => c.severity === 'warning').length,
  };
}

/** Starting values the project's design basis does not carry; the engineer changes them in the scheme. */
export const STARTING_VALUES = {
  // 250 mm beams and a 20 × 15 m outline are common practice starting points, not design values.
  beamWidthMm: 250,
  wallLoadKNPerM: 0,
  outline: { widthM: 20, depthM: 15 },
} as const;

const NO_RATES = { concretePerM3: 0, steelPerKg: 0, formworkPerM2: 0 } as const;

/**
 * A new scheme from the project's design basis: the basis, storeys and storey height filled in,
 * a rectangular plot outline to redraw, no grid or columns yet, and the project's unit rates in
 * its currency (zero for a project that has none yet, until the engineer enters them).
 */
export function startingDocument(
  project: { storeys: number; storeyHeightM: number; currency: string; designBasis: ProjectDesignBasis },
  id: string,
  name: string,
): SchemeDocument {
  const { widthM, depthM } = STARTING_VALUES.outline;
  return schemeSchema.parse({
    schemaVersion: SCHEME_SCHEMA_VERSION,
    id,
    name,
    basis: {
      ...project.designBasis,
      wallLoadKNPerM: STARTING_VALUES.wallLoadKNPerM,
      storeys: project.storeys,
      storeyHeightM: project.storeyHeightM,
      beamWidthMm: STARTING_VALUES.beamWidthMm,
      rates: { currency: project.currency, ...(project.designBasis.rates ?? NO_RATES) },
    },
    boundary: {
      vertices: [
        { x: 0, y: 0 },
        { x: widthM, y: 0 },
        { x: widthM, y: depthM },
        { x: 0, y: depthM },
      ],
      propertyLines: [],
    },
    grid: [],
    columns: [],
    secondaryBeams: [],
    stairs: [],
    footingChoices: [],
  });
}
