import type { CalcVerb } from '../calc/verbs';

/** Calc verbs of the forecast module (filled in by the forecast work). */
export const forecastCalcVerbs: Record<string, CalcVerb> = {};
