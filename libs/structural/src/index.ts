// Public surface of the structural planning engine. Pure TypeScript, no I/O.
// Units: SI throughout (m, mm where a name says Mm, kN, kN/m, kPa, kN·m, MPa).
export * from './model';
export {
  CAUTION,
  codeDefaults,
  resolveLimits,
  concreteModulusMPa,
  beamDepthRule,
  slabDepthRule,
  limitingMomentKNm,
  columnCapacityKN,
  LIMIT_KEYS,
  EN_ALPHA_CC_DEFAULT,
  SOURCE_KINDS,
} from './codes';
export { StructuralInputError } from './errors';
export type {
  CodeDefaults,
  Combination,
  Limit,
  LimitKey,
  Limits,
  SourceKind,
  SupportCondition,
  DepthRule,
} from './codes';
export { validateScheme, SCHEME_LIMITS } from './validate';
export {
  analyseBeam,
  continuousBeam,
  uniformLoad,
  pointLoad,
  validateBeamModel,
  validateLoads,
  BEAM_RANGES,
} from './beam';
export type { BeamLoad, BeamModel, BeamMember, BeamResult, MemberResult, PointLoad, LinearLoad, Support } from './beam';
export { envelopeBeam, loadPatterns, validateCombinations } from './envelope';
export type { BeamEnvelope, MemberEnvelope } from './envelope';
export { twoWayEquivalentLoads } from './loads';
export type { PanelLoad, SecondaryLoad } from './loads';
export { isolatedFooting, rectangularCombined, trapezoidalCombined, strapFooting, FOOTING_RANGES } from './footings';
export type { IsolatedFooting, RectCombined, TrapezoidCombined, StrapFooting } from './footings';
export type { BoundaryOptions, OverlapCombined } from './site';
export { beamDepth, columnSize } from './sizing';
export type { BeamSize, ColumnStoreySize, SlabSize } from './sizing';
export { RULES, CheckList, splitChecks, stairChecks } from './checks';
export type { Check, PassedRule, Severity } from './checks';
export type { Quantities, QuantityRow, Cost, CostRow, MemberType } from './quantities';
export { analyseScheme } from './analyse';
export { EngineMemo } from './memo';
export { beamLineDiagram, type BeamLineDiagram } from './diagrams';
export type { SchemeResult, BeamLineResult, ColumnLoads, ColumnSizes, LevelKind } from './analyse';
export { compareSchemes, compareResults } from './compare';
export type { SchemeComparison } from './compare';
export { demoScheme, demoSchemeVariant } from './demo';
export { ENGINE_VERSION } from './version';
