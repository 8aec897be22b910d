// Quantities by member type and their cost at the scheme's unit rates. Reinforcement comes from
// typical kg/m³ ratios per member type (common practice), not from a bar schedule.
import type { Limits } from './codes';
import type { UnitRates } from './model';

export type MemberType = 'slabs' | 'beams' | 'columns' | 'footings' | 'stairs';
export const MEMBER_TYPES: MemberType[] = ['slabs', 'beams', 'columns', 'footings', 'stairs'];

export interface QuantityRow {
  member: MemberType;
  concreteM3: number;
  steelKg: number;
  formworkM2: number;
  /** kg of steel per m³ of concrete used, and where it comes from */
  steelRatioKgPerM3: number;
  steelRatioSource: string;
}

export interface Quantities {
  rows: QuantityRow[];
  totals: { concreteM3: number; steelKg: number; formworkM2: number };
  notes: string[];
}

export interface CostRow {
  member: MemberType;
  concrete: number;
  steel: number;
  formwork: number;
  total: number;
}

export interface Cost {
  currency: string;
  rows: CostRow[];
  total: number;
}

/** Accumulates concrete (m³) and formwork (m²) per member type. */
export class QuantityTally {
  private readonly c = new Map<MemberType, { concrete: number; formwork: number }>();
  add(member: MemberType, concreteM3: number, formworkM2: number): void {
    const r = this.c.get(member) ?? { concrete: 0, formwork: 0 };
    r.concrete += concreteM3;
    r.formwork += formworkM2;
    this.c.set(member, r);
  }
  /** Quantities with steel by the typical ratios in limits (kg/m³). */
  finish(limits: Limits, notes: string[]): Quantities {
    const ratio: Record<MemberType, { value: number; source: string }> = {
      slabs: limits.rebarSlabKgPerM3,
      beams: limits.rebarBeamKgPerM3,
      columns: limits.rebarColumnKgPerM3,
      footings: limits.rebarFootingKgPerM3,
      stairs: limits.rebarSlabKgPerM3,
    };
    const rows = MEMBER_TYPES.map((member) => {
      const r = this.c.get(member) ?? { concrete: 0, formwork: 0 };
      return {
        member,
        concreteM3: r.concrete,
        steelKg: r.concrete * ratio[member].value,
        formworkM2: r.formwork,
        steelRatioKgPerM3: ratio[member].value,
        steelRatioSource: ratio[member].source,
      };
    });
    const totals = rows.reduce(
      (t, r) => ({
        concreteM3: t.concreteM3 + r.concreteM3,
        steelKg: t.steelKg + r.steelKg,
        formworkM2: t.formworkM2 + r.formworkM2,
      }),
      { concreteM3: 0, steelKg: 0, formworkM2: 0 },
    );
    return { rows, totals, notes };
  }
}

/** Cost of quantities at unit rates (currency per m³, per kg, per m²). */
export function costOf(q: Quantities, rates: UnitRates): Cost {
  const rows = q.rows.map((r) => {
    const concrete = r.concreteM3 * rates.concretePerM3;
    const steel = r.steelKg * rates.steelPerKg;
    const formwork = r.formworkM2 * rates.formworkPerM2;
    return { member: r.member, concrete, steel, formwork, total: concrete + steel + formwork };
  });
  return { currency: rates.currency, rows, total: rows.reduce((a, r) => a + r.total, 0) };
}
