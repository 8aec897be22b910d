// An invented demo: "Tamarind Row", a seven-storey residential block on a tight urban plot whose
// south and west sides are property lines, and a variant with one interior column left out.
import type { Column, GridLine, Scheme } from './model';

const X = [
  { id: 'A', x: 0.2 },
  { id: 'B', x: 4.4 },
  { id: 'C', x: 8.6 },
  { id: 'D', x: 12.8 },
];
const Y = [
  { id: '1', y: 0.2 },
  { id: '2', y: 4.2 },
  { id: '3', y: 8.2 },
  { id: '4', y: 12.2 },
  { id: '5', y: 16.2 },
];

/** The demo scheme (IS 456 family): 4 × 5 grid, 20 columns, property lines on the south and west. Units as the model (m, mm, kN, kPa, MPa). */
export function demoScheme(): Scheme {
  const walls = new Set(['A', 'D', '1', '5', '3']);
  const grid: GridLine[] = [
    ...X.map((g) => ({ id: g.id, label: g.id, x: g.x, ...(walls.has(g.id) ? { wallThicknessMm: 230 } : {}) })),
    ...Y.map((g) => ({ id: g.id, label: g.id, y: g.y, ...(walls.has(g.id) ? { wallThicknessMm: 230 } : {}) })),
  ];
  // a balcony cantilever beyond the east end of line 5
  (grid.find((g) => g.id === '5') as GridLine).overhangEndM = 1.2;
  const columns: Column[] = [];
  for (const gx of X)
    for (const gy of Y) {
      // 230 mm across the wall they stand in; corner columns still stand proud of one wall
      const edge = gx.id === 'A' || gx.id === 'D';
      columns.push({
        id: `${gx.id}${gy.id}`,
        label: `${gx.id}${gy.id}`,
        x: gx.x,
        y: gy.y,
        widthMm: 230,
        depthMm: 500,
        orientationDeg: edge ? 0 : 90,
      });
    }
  return {
    schemaVersion: 2,
    id: 'tamarind-row-s1',
    name: 'Tamarind Row, scheme 1: full grid',
    basis: {
      codeFamily: 'IS456',
      concreteMPa: 25,
      steelMPa: 500,
      imposedKPa: 2.0,
      roofImposedKPa: 1.5,
      superimposedDeadKPa: 1.5,
      wallLoadKNPerM: 12,
      bearingPressureKPa: 150,
      foundingDepthM: 1.5,
      storeys: 7,
      storeyHeightM: 3.0,
      beamWidthMm: 230,
      rates: { currency: 'INR', concretePerM3: 6500, steelPerKg: 75, formworkPerM2: 550 },
    },
    boundary: {
      vertices: [
        { x: 0, y: 0 },
        { x: 14.5, y: 0 },
        { x: 14.5, y: 18 },
        { x: 0, y: 18 },
      ],
      propertyLines: [0, 3],
    },
    grid,
    columns,
    secondaryBeams: [{ id: 'SB1', start: { x: 4.4, y: 6.2 }, end: { x: 8.6, y: 6.2 } }],
    stairs: [{ id: 'ST1', riserMm: 170, treadMm: 260, risers: 9, widthM: 1.1, use: 'residential' }],
    footingChoices: [],
  };
}

/** The variant: column B3 left out, so lines B and 3 span two bays there (8.0 m and 8.4 m). Units as the model. */
export function demoSchemeVariant(): Scheme {
  const s = demoScheme();
  return {
    ...s,
    id: 'tamarind-row-s2',
    name: 'Tamarind Row, scheme 2: without column B3',
    columns: s.columns.filter((c) => c.id !== 'B3'),
  };
}
