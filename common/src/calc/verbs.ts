import { gasCalcVerbs } from '../gas/calc-verbs';
import { forecastCalcVerbs } from '../forecast/calc-verbs';
import { capacityCalcVerbs } from '../capacity/calc-verbs';
import { InvalidInputError } from '../api/errors';

/**
 * A calc verb takes one parsed JSON value and returns one JSON value. It throws InvalidInputError
 * (from common/src/api/errors) for bad input; the command line maps that to exit 2, the API to 400.
 */
export type CalcVerb = (input: unknown) => unknown;

/** The path of the first number in `value` that is not finite (NaN, ±Infinity), or null. */
function firstNonFinite(value: unknown, path: string): string | null {
  if (typeof value === 'number') return Number.isFinite(value) ? null : path || '(root)';
  if (value === null || typeof value !== 'object') return null;
  for (const [k, v] of Array.isArray(value) ? value.entries() : Object.entries(value)) {
    const hit = firstNonFinite(v, path ? `${path}.${k}` : String(k));
    if (hit !== null) return hit;
  }
  return null;
}

/**
 * The last guard of the contract: an answer whose numbers are not all finite (JSON would show them
 * as null) is refused as invalid input instead. The schemas bound every input to a physically
 * meaningful range, so this should never fire; if it does, the person gets a clear refusal, not a null.
 */
export function finiteOrRefused(verb: CalcVerb): CalcVerb {
  return (input) => {
    const out = verb(input);
    const bad = firstNonFinite(out, '');
    if (bad !== null) {
      throw new InvalidInputError(`The inputs give a result that is not a finite number (${bad}): check that every value is in a physically meaningful range`, [
        { path: '(root)', message: `result ${bad} is not finite` },
      ]);
    }
    return out;
  };
}

/** Every verb of `npm run calc -- VERB` and `POST /api/calc/VERB`. Names are a public contract. */
export const calcVerbs: Record<string, CalcVerb> = Object.fromEntries(
  Object.entries({ ...gasCalcVerbs, ...forecastCalcVerbs, ...capacityCalcVerbs }).map(([name, verb]) => [name, finiteOrRefused(verb)]),
);
