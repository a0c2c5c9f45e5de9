import type { CalcVerb } from '../calc/verbs';

/** Calc verbs of the capacity module (filled in by the capacity work). */
export const capacityCalcVerbs: Record<string, CalcVerb> = {};
