// The generated benchmark scheme: 30 × 30 grid of columns, 10 storeys.
import type { Scheme } from '../src/index';

const N = 30;

export function generatedScheme(): Scheme {
  const xs = Array.from({ length: N }, (_, i) => 0.5 + i * 5 + (i % 3 === 1 ? 0.4 : 0));
  const ys = Array.from({ length: N }, (_, j) => 0.5 + j * 4.5);
  return {
    schemaVersion: 1,
    id: 'bench',
    name: 'Generated 30 × 30 grid',
    basis: {
      codeFamily: 'IS456',
      concreteMPa: 30,
      steelMPa: 500,
      imposedKPa: 3,
      roofImposedKPa: 1.5,
      superimposedDeadKPa: 1.5,
      wallLoadKNPerM: 12,
      bearingPressureKPa: 200,
      foundingDepthM: 2,
      storeys: 10,
      storeyHeightM: 3.2,
      beamWidthMm: 300,
      rates: { currency: 'XTS', concretePerM3: 120, steelPerKg: 1.1, formworkPerM2: 25 },
    },
    boundary: {
      vertices: [
        { x: 0, y: 0 },
        { x: 160, y: 0 },
        { x: 160, y: 140 },
        { x: 0, y: 140 },
      ],
      propertyLines: [0, 3],
    },
    grid: [
      ...xs.map((x, i) => ({ id: `X${i}`, label: `X${i}`, x, ...(i % 5 === 0 ? { wallThicknessMm: 230 } : {}) })),
      ...ys.map((y, j) => ({ id: `Y${j}`, label: `Y${j}`, y, ...(j === N - 1 ? { overhangEndM: 1.5 } : {}) })),
    ],
    columns: xs.flatMap((x, i) =>
      ys.map((y, j) => ({
        id: `C${i}-${j}`,
        label: `C${i}-${j}`,
        x,
        y,
        widthMm: 450,
        depthMm: 450,
        orientationDeg: 0 as const,
      })),
    ),
    // a secondary beam across every fourth bay along y, landing mid-span on the x-running lines
    secondaryBeams: xs.slice(0, -1).flatMap((x, i) =>
      i % 4 === 0
        ? ys
            .slice(0, -1)
            .filter((_, j) => j % 2 === 0)
            .map((y, j) => ({ id: `SB${i}-${j}`, start: { x: x + 2.5, y }, end: { x: x + 2.5, y: y + 4.5 } }))
        : [],
    ),
    stairs: [{ id: 'F1', riserMm: 165, treadMm: 280, risers: 10, widthM: 1.2, use: 'other' }],
  };
}
