// Validation of a scheme as it arrives (any JSON value): every problem names the element and
// the field, so that an editor can point at it. Nothing here throws.
import { LIMIT_KEYS } from './codes';
import type { Problem } from './model';

type Obj = Record<string, unknown>;

/**
 * Physically sensible ranges; anything beyond is refused with the range. Loads in kPa, plan
 * coordinates in m, counts of elements (a scheme beyond them is not a building the engine plans).
 */
export const SCHEME_LIMITS = {
  loadKPa: 50,
  coordM: 5000,
  gridLines: 2000,
  columns: 10000,
  secondaryBeams: 10000,
  stairs: 200,
  vertices: 1000,
} as const;
const LIM = SCHEME_LIMITS;
const XY = { min: -SCHEME_LIMITS.coordM, max: SCHEME_LIMITS.coordM };
const isObj = (v: unknown): v is Obj => typeof v === 'object' && v !== null && !Array.isArray(v);

interface NumRule {
  optional?: boolean;
  min?: number;
  /** strictly greater than */
  gt?: number;
  /** at most */
  max?: number;
  int?: boolean;
}

class Collector {
  readonly problems: Problem[] = [];
  add(path: string, field: string, message: string, elementId?: string): void {
    this.problems.push(elementId === undefined ? { path, field, message } : { path, elementId, field, message });
  }
  num(o: Obj, base: string, field: string, rule: NumRule, elementId?: string): number | undefined {
    const v = o[field];
    const path = base ? `${base}.${field}` : field;
    if (v === undefined && rule.optional) return undefined;
    if (typeof v !== 'number' || !Number.isFinite(v)) {
      this.add(path, field, 'must be a number', elementId);
      return undefined;
    }
    if (rule.int && !Number.isInteger(v)) this.add(path, field, 'must be a whole number', elementId);
    if (rule.gt !== undefined && !(v > rule.gt)) this.add(path, field, `must be greater than ${rule.gt}`, elementId);
    if (rule.min !== undefined && v < rule.min)
      this.add(
        path,
        field,
        `must be at least ${rule.min}${rule.max !== undefined ? ` (accepted: ${rule.min} to ${rule.max})` : ''}`,
        elementId,
      );
    if (rule.max !== undefined && v > rule.max)
      this.add(
        path,
        field,
        `must be at most ${rule.max} (accepted: ${rule.min ?? rule.gt ?? '−'}${rule.gt !== undefined && rule.min === undefined ? ' exclusive' : ''} to ${rule.max})`,
        elementId,
      );
    return v;
  }
  str(o: Obj, base: string, field: string, elementId?: string): string | undefined {
    const v = o[field];
    if (typeof v !== 'string' || v.trim() === '') {
      this.add(base ? `${base}.${field}` : field, field, 'must be a non-empty text', elementId);
      return undefined;
    }
    return v;
  }
  arr(o: Obj, field: string, max: number): unknown[] {
    const v = o[field];
    if (!Array.isArray(v)) {
      this.add(field, field, 'must be a list');
      return [];
    }
    if (v.length > max) {
      // the rest is not looked at: a scheme this large is refused as a whole
      this.add(field, field, `at most ${max} entries (got ${v.length})`);
      return [];
    }
    return v;
  }
}

function uniqueIds(c: Collector, list: unknown[], base: string): void {
  const seen = new Set<string>();
  list.forEach((e, i) => {
    if (!isObj(e) || typeof e['id'] !== 'string') return;
    if (seen.has(e['id'])) c.add(`${base}[${i}].id`, 'id', `duplicate id "${e['id']}"`, e['id']);
    seen.add(e['id']);
  });
}

/**
 * Checks a scheme (units as in the model: m, mm where named, kN, kPa, MPa) and returns its
 * problems; an empty list means the engine can analyse it.
 */
export function validateScheme(input: unknown): Problem[] {
  const c = new Collector();
  if (!isObj(input)) {
    c.add('', 'scheme', 'a scheme must be an object');
    return c.problems;
  }
  if (input['schemaVersion'] !== 1 && input['schemaVersion'] !== 2)
    c.add('schemaVersion', 'schemaVersion', 'unsupported schema version (expected 1 or 2)');
  c.str(input, '', 'id');
  c.str(input, '', 'name');

  const basis = input['basis'];
  if (!isObj(basis)) c.add('basis', 'basis', 'the design basis is missing');
  else {
    if (!['IS456', 'ACI318', 'EN1992'].includes(basis['codeFamily'] as string))
      c.add('basis.codeFamily', 'codeFamily', 'must be one of IS456, ACI318, EN1992');
    c.num(basis, 'basis', 'concreteMPa', { min: 10, max: 120 });
    c.num(basis, 'basis', 'steelMPa', { min: 200, max: 700 });
    if (basis['codeFamily'] === 'IS456' && typeof basis['steelMPa'] === 'number' && basis['steelMPa'] > 550)
      c.add(
        'basis.steelMPa',
        'steelMPa',
        'IS 456:2000 covers reinforcement grades up to Fe 550 (accepted: 200 to 550 for IS456)',
      );
    c.num(basis, 'basis', 'imposedKPa', { min: 0, max: LIM.loadKPa });
    c.num(basis, 'basis', 'roofImposedKPa', { min: 0, max: LIM.loadKPa, optional: true });
    c.num(basis, 'basis', 'superimposedDeadKPa', { min: 0, max: LIM.loadKPa });
    c.num(basis, 'basis', 'wallLoadKNPerM', { min: 0, max: 200 });
    c.num(basis, 'basis', 'bearingPressureKPa', { min: 10, max: 10000 });
    c.num(basis, 'basis', 'foundingDepthM', { min: 0, max: 50 });
    c.num(basis, 'basis', 'storeys', { min: 1, max: 200, int: true });
    c.num(basis, 'basis', 'storeyHeightM', { min: 2, max: 20 });
    c.num(basis, 'basis', 'slabThicknessMm', { min: 50, max: 1500, optional: true });
    c.num(basis, 'basis', 'alphaCc', { min: 0.8, max: 1, optional: true });
    c.num(basis, 'basis', 'beamWidthMm', { min: 100, max: 3000 });
    const rates = basis['rates'];
    if (!isObj(rates)) c.add('basis.rates', 'rates', 'unit rates are missing');
    else {
      c.str(rates, 'basis.rates', 'currency');
      c.num(rates, 'basis.rates', 'concretePerM3', { min: 0, max: 1e9 });
      c.num(rates, 'basis.rates', 'steelPerKg', { min: 0, max: 1e9 });
      c.num(rates, 'basis.rates', 'formworkPerM2', { min: 0, max: 1e9 });
    }
    const ov = basis['limitOverrides'];
    if (ov !== undefined) {
      if (!isObj(ov)) c.add('basis.limitOverrides', 'limitOverrides', 'must be an object of limit key to number');
      else
        for (const [k, v] of Object.entries(ov)) {
          if (!(LIMIT_KEYS as readonly string[]).includes(k)) c.add(`basis.limitOverrides.${k}`, k, 'unknown limit');
          else if (typeof v !== 'number' || !Number.isFinite(v) || v < 0 || v > 1e6)
            c.add(`basis.limitOverrides.${k}`, k, "must be a number from 0 to 1000000 in the limit's unit");
        }
    }
  }

  const boundary = input['boundary'];
  if (!isObj(boundary)) c.add('boundary', 'boundary', 'the plot boundary is missing');
  else {
    const vs = Array.isArray(boundary['vertices']) ? (boundary['vertices'] as unknown[]) : [];
    if (vs.length > LIM.vertices) c.add('boundary.vertices', 'vertices', `at most ${LIM.vertices} vertices`);
    if (vs.length < 3) c.add('boundary.vertices', 'vertices', 'the boundary needs at least three vertices');
    vs.slice(0, LIM.vertices).forEach((v, i) => {
      if (!isObj(v)) c.add(`boundary.vertices[${i}]`, 'vertices', 'must be a point {x, y}');
      else {
        c.num(v, `boundary.vertices[${i}]`, 'x', { min: -LIM.coordM, max: LIM.coordM });
        c.num(v, `boundary.vertices[${i}]`, 'y', { min: -LIM.coordM, max: LIM.coordM });
      }
    });
    const pl = boundary['propertyLines'];
    if (!Array.isArray(pl)) c.add('boundary.propertyLines', 'propertyLines', 'must be a list of segment indices');
    else
      pl.forEach((k, i) => {
        if (!Number.isInteger(k) || (k as number) < 0 || (k as number) >= vs.length)
          c.add(`boundary.propertyLines[${i}]`, 'propertyLines', `segment index must be 0..${vs.length - 1}`);
      });
  }

  const grid = c.arr(input, 'grid', LIM.gridLines);
  uniqueIds(c, grid, 'grid');
  grid.forEach((g, i) => {
    const base = `grid[${i}]`;
    if (!isObj(g)) return c.add(base, 'grid', 'must be an object');
    const id = typeof g['id'] === 'string' ? g['id'] : undefined;
    c.str(g, base, 'id', id);
    c.str(g, base, 'label', id);
    const hasX = g['x'] !== undefined;
    const hasY = g['y'] !== undefined;
    if (hasX === hasY) c.add(`${base}.x`, 'x', 'a grid line sets exactly one of x or y', id);
    else c.num(g, base, hasX ? 'x' : 'y', { min: -LIM.coordM, max: LIM.coordM }, id);
    c.num(g, base, 'overhangStartM', { min: 0, max: 10, optional: true }, id);
    c.num(g, base, 'overhangEndM', { min: 0, max: 10, optional: true }, id);
    c.num(g, base, 'wallThicknessMm', { min: 0, max: 1000, optional: true }, id);
    c.num(g, base, 'beamWidthMm', { min: 100, max: 3000, optional: true }, id);
    c.num(g, base, 'beamDepthMm', { min: 100, max: 5000, optional: true }, id);
  });

  // two grid lines on the same coordinate would make a bay of zero width
  const seenAt = new Map<string, string>();
  grid.forEach((g, i) => {
    if (!isObj(g)) return;
    const axis = g['x'] !== undefined ? 'x' : 'y';
    const v = g[axis];
    if (typeof v !== 'number' || !Number.isFinite(v) || (g['x'] !== undefined && g['y'] !== undefined)) return;
    const key = `${axis}${Math.round(v * 20)}`;
    const id = typeof g['id'] === 'string' ? g['id'] : undefined;
    const other = seenAt.get(key);
    if (other !== undefined) c.add(`grid[${i}].${axis}`, axis, `lies within 0.05 m of grid line ${other}`, id);
    else seenAt.set(key, id ?? `#${i}`);
  });

  const cols = c.arr(input, 'columns', LIM.columns);
  uniqueIds(c, cols, 'columns');
  const pos: { id: string; x: number; y: number; i: number }[] = [];
  cols.forEach((col, i) => {
    const base = `columns[${i}]`;
    if (!isObj(col)) return c.add(base, 'columns', 'must be an object');
    const id = typeof col['id'] === 'string' ? col['id'] : undefined;
    c.str(col, base, 'id', id);
    c.str(col, base, 'label', id);
    const x = c.num(col, base, 'x', { min: -LIM.coordM, max: LIM.coordM }, id);
    const y = c.num(col, base, 'y', { min: -LIM.coordM, max: LIM.coordM }, id);
    c.num(col, base, 'widthMm', { min: 100, max: 5000 }, id);
    c.num(col, base, 'depthMm', { min: 100, max: 5000 }, id);
    if (col['orientationDeg'] !== 0 && col['orientationDeg'] !== 90)
      c.add(`${base}.orientationDeg`, 'orientationDeg', 'must be 0 or 90', id);
    if (x !== undefined && y !== undefined && id) pos.push({ id, x, y, i });
  });
  pos.sort((a, b) => a.x - b.x);
  for (let i = 0; i < pos.length; i++)
    for (let j = i + 1; j < pos.length && pos[j].x - pos[i].x < 0.05; j++)
      if (Math.hypot(pos[j].x - pos[i].x, pos[j].y - pos[i].y) < 0.05)
        c.add(`columns[${pos[j].i}].x`, 'x', `stands on the same spot as column ${pos[i].id}`, pos[j].id);

  const secs = c.arr(input, 'secondaryBeams', LIM.secondaryBeams);
  uniqueIds(c, secs, 'secondaryBeams');
  secs.forEach((s, i) => {
    const base = `secondaryBeams[${i}]`;
    if (!isObj(s)) return c.add(base, 'secondaryBeams', 'must be an object');
    const id = typeof s['id'] === 'string' ? s['id'] : undefined;
    c.str(s, base, 'id', id);
    const a = s['start'],
      b = s['end'];
    if (!isObj(a) || !isObj(b)) return c.add(`${base}.start`, 'start', 'start and end must be points {x, y}', id);
    const ax = c.num(a, `${base}.start`, 'x', XY, id),
      ay = c.num(a, `${base}.start`, 'y', XY, id);
    const bx = c.num(b, `${base}.end`, 'x', XY, id),
      by = c.num(b, `${base}.end`, 'y', XY, id);
    if ([ax, ay, bx, by].every((v) => v !== undefined)) {
      const dx = Math.abs((bx as number) - (ax as number)),
        dy = Math.abs((by as number) - (ay as number));
      if (dx > 0.02 && dy > 0.02) c.add(`${base}.end`, 'end', 'a secondary beam must run parallel to x or to y', id);
      if (dx < 0.1 && dy < 0.1) c.add(`${base}.end`, 'end', 'a secondary beam must be longer than 0.1 m', id);
    }
    c.num(s, base, 'widthMm', { min: 100, max: 3000, optional: true }, id);
    c.num(s, base, 'depthMm', { min: 100, max: 5000, optional: true }, id);
  });

  const stairs = c.arr(input, 'stairs', LIM.stairs);
  uniqueIds(c, stairs, 'stairs');
  stairs.forEach((f, i) => {
    const base = `stairs[${i}]`;
    if (!isObj(f)) return c.add(base, 'stairs', 'must be an object');
    const id = typeof f['id'] === 'string' ? f['id'] : undefined;
    c.str(f, base, 'id', id);
    c.num(f, base, 'riserMm', { min: 50, max: 400 }, id);
    c.num(f, base, 'treadMm', { min: 100, max: 1000 }, id);
    c.num(f, base, 'risers', { min: 1, max: 100, int: true }, id);
    c.num(f, base, 'widthM', { min: 0.5, max: 20 }, id);
    if (f['use'] !== 'residential' && f['use'] !== 'other')
      c.add(`${base}.use`, 'use', 'must be residential or other', id);
  });
  return c.problems;
}
