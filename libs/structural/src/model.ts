// The scheme: one structural layout of one building, as the engine reads it.
// Units are SI throughout: lengths in metres unless a field name says Mm (millimetres),
// loads in kN, kN/m and kPa (kN/m²), stresses in MPa.

/** The three code families the engine knows. */
export type CodeFamily = 'IS456' | 'ACI318' | 'EN1992';

/** Unit rates for cost, in the scheme's currency. */
export interface UnitRates {
  currency: string;
  /** per m³ of concrete placed */
  concretePerM3: number;
  /** per kg of reinforcement fixed */
  steelPerKg: number;
  /** per m² of formwork (contact area) */
  formworkPerM2: number;
}

export interface DesignBasis {
  codeFamily: CodeFamily;
  /** characteristic concrete strength, MPa (IS: cube fck; ACI: f'c; EN: cylinder fck) */
  concreteMPa: number;
  /** characteristic yield strength of reinforcement, MPa */
  steelMPa: number;
  /** imposed (live) load on floors, kPa */
  imposedKPa: number;
  /** imposed load on the roof, kPa (defaults to imposedKPa) */
  roofImposedKPa?: number;
  /** superimposed dead load (finishes, services, partitions allowance), kPa */
  superimposedDeadKPa: number;
  /** line load of a storey-high wall standing on a beam, kN/m */
  wallLoadKNPerM: number;
  /** allowable (net) bearing pressure of the soil, kPa */
  bearingPressureKPa: number;
  /** depth of the footing base below ground, m */
  foundingDepthM: number;
  storeys: number;
  /** floor-to-floor height, m */
  storeyHeightM: number;
  /** slab thickness chosen by the engineer, mm (derived when absent) */
  slabThicknessMm?: number;
  /**
   * EN 1992-1-1 αcc (§3.1.6(1)): the recommended value is 1.0 (the default); a national annex
   * may set another value from 0.8 to 1.0. Used only by the EN 1992 family.
   */
  alphaCc?: number;
  /** beam width used for all beams unless a grid line says otherwise, mm */
  beamWidthMm: number;
  rates: UnitRates;
  /** per-project overrides of the default limits, by limit key (see codeDefaults) */
  limitOverrides?: Partial<Record<string, number>>;
}

export interface Point {
  x: number;
  y: number;
}

export interface PlotBoundary {
  /** polygon vertices in order, m; segment i runs from vertex i to vertex i+1 (last closes to first) */
  vertices: Point[];
  /** indices of the segments that are property lines (footings may not cross them) */
  propertyLines: number[];
}

/**
 * A grid line: exactly one of x or y is set. `{ x: 6 }` is the line x = 6 m (it runs along y);
 * `{ y: 0 }` is the line y = 0 (it runs along x). Beams are generated along every grid line
 * that carries two or more columns.
 */
export interface GridLine {
  id: string;
  label: string;
  x?: number;
  y?: number;
  /** cantilever beam beyond the first column on this line, m */
  overhangStartM?: number;
  /** cantilever beam beyond the last column on this line, m */
  overhangEndM?: number;
  /** thickness of the wall standing on this line's beams, mm; absent or 0 = no wall */
  wallThicknessMm?: number;
  /** beam section on this line, mm; depth is derived when absent */
  beamWidthMm?: number;
  beamDepthMm?: number;
}

export interface Column {
  id: string;
  label: string;
  x: number;
  y: number;
  /** section, mm: widthMm lies along x and depthMm along y when orientationDeg is 0 */
  widthMm: number;
  depthMm: number;
  orientationDeg: 0 | 90;
}

/** A secondary beam framing into primary beams at both ends; it must run parallel to a plan axis. */
export interface SecondaryBeam {
  id: string;
  start: Point;
  end: Point;
  widthMm?: number;
  depthMm?: number;
  /** a wall stands on it */
  carriesWall?: boolean;
}

export interface StairFlight {
  id: string;
  riserMm: number;
  treadMm: number;
  risers: number;
  widthM: number;
  /** occupancy, which sets the limits */
  use: 'residential' | 'other';
}

/** The footing option the engineer chose for a column at a property line, and why. */
export interface FootingChoice {
  columnId: string;
  option: 'shift' | 'strap' | 'combinedRectangular' | 'combinedTrapezoidal' | 'combinedOverlap' | 'isolated';
  reason: string;
}

export interface Scheme {
  /** 2 added footingChoices; version 1 documents are still read */
  schemaVersion: 1 | 2;
  id: string;
  name: string;
  basis: DesignBasis;
  boundary: PlotBoundary;
  grid: GridLine[];
  columns: Column[];
  secondaryBeams: SecondaryBeam[];
  stairs: StairFlight[];
  /**
   * The engineer's recorded footing choices. A record only: the engine's results do not depend
   * on them (a chosen shift is a separate edit that moves the column).
   */
  footingChoices?: FootingChoice[];
}

/** A problem with the input: names the element and the field; never thrown. */
export interface Problem {
  /** JSON-path-like location, e.g. "columns[3].widthMm" */
  path: string;
  elementId?: string;
  field: string;
  message: string;
}
