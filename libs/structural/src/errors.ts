// The one error type the engine throws. Analyses (analyseScheme, analyseBeam, envelopeBeam,
// validateScheme) return problems instead; builders and formula helpers, which return plain
// numbers, throw this when their input is outside what they accept.
import type { Problem } from './model';

/** The input is outside what the function accepts; `problems` names each field and the accepted range. */
export class StructuralInputError extends Error {
  constructor(readonly problems: Problem[]) {
    super(problems.map((p) => `${p.path}: ${p.message}`).join('; '));
    this.name = 'StructuralInputError';
  }
}
