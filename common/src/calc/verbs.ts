import { gasCalcVerbs } from '../gas/calc-verbs';
import { forecastCalcVerbs } from '../forecast/calc-verbs';
import { capacityCalcVerbs } from '../capacity/calc-verbs';

/**
 * A calc verb takes one parsed JSON value and returns one JSON value. It throws InvalidInputError
 * (from common/src/api/errors) for bad input; the command line maps that to exit 2, the API to 400.
 */
export type CalcVerb = (input: unknown) => unknown;

/** Every verb of `npm run calc -- VERB` and `POST /api/calc/VERB`. Names are a public contract. */
export const calcVerbs: Record<string, CalcVerb> = {
  ...gasCalcVerbs,
  ...forecastCalcVerbs,
  ...capacityCalcVerbs,
};
