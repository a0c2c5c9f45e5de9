import type { CalcVerb } from '../calc/verbs';

/** Calc verbs of the gas module (filled in by the gas work). */
export const gasCalcVerbs: Record<string, CalcVerb> = {};
