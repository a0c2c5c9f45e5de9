import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { InvalidInputError } from '../api/errors';
import { calcVerbs as guardedVerbs, finiteOrRefused } from './verbs';
import { gasCalcVerbs } from '../gas/calc-verbs';
import { forecastCalcVerbs } from '../forecast/calc-verbs';
import { capacityCalcVerbs } from '../capacity/calc-verbs';

/**
 * The verbs without the last guard of verbs.ts (which refuses any non-finite answer): the properties
 * below check that the input bounds alone keep every answer finite.
 */
const calcVerbs: Record<string, (input: unknown) => unknown> = { ...gasCalcVerbs, ...forecastCalcVerbs, ...capacityCalcVerbs };

/**
 * Property-based checks over every calc verb (the contract of `npm run calc` and POST /api/calc/VERB):
 * whatever JSON arrives, a verb either answers with JSON or refuses with InvalidInputError naming the
 * field — never another exception (which the API would turn into a 500 and the command line into a crash).
 *
 * Two generators per verb: arbitrary JSON, and a valid example with one field replaced by an arbitrary
 * value or removed (the near misses a person or a script really sends: a string for a number, a negative
 * pressure, a huge number, null, a missing key).
 */

/** One valid input per verb, taken from the verbs' own worked examples. A new verb must be added here. */
const EXAMPLES: Record<string, unknown> = {
  z: [
    { gas: 'O2', temperature_C: 15, pressure_bar_abs: 200 },
    { gas: 'HE', temperature_C: -20, pressure_bar_abs: 137 },
  ],
  contents: [
    { gas: 'O2', water_capacity_L: 10, gauge_bar: 200, temperature_C: 15 },
    { gas: 'N2O', gross_kg: 20, tare_kg: 15, water_capacity_L: 10, temperature_C: 15 },
  ],
  duration: { gas: 'O2', water_capacity_L: 10, gauge_bar: 200, temperature_C: 15, flow_L_min: 10, reserve_gauge_bar: 20 },
  pressure_at_temperature: { gas: 'O2', gauge_bar: 200, temperature_C: 15, new_temperature_C: -10 },
  forecast: {
    start: '2027-01-04T00:00',
    timezone: 'Europe/London',
    horizon_days: 30,
    reference: '15C',
    source: {
      type: 'bulk_liquid',
      gas: 'O2',
      capacity_kg: 10000,
      contents_kg: 6000,
      evaporation_percent_per_day: 0.5,
      reorder_level_kg: 2500,
      order_up_to_kg: 9500,
      lead_time_hours: 48,
    },
    demand: [{ flow_L_min: 100 }, { flow_L_min: 200, hours: [8, 9, 10, 11, 12], weekdays: [1, 2, 3, 4, 5] }],
    deliveries: [{ at: '2027-01-10T06:00', kg: 4000 }],
    draws: 20,
    demand_cv: 0.2,
    seed: 1,
  },
  'design-flow': { gas: 'VAC', rule_set: 'default', zones: [{ name: 'Ward 4', department: 'ward', terminal_units: 10 }] },
  'diversity-rules': { rule_set: 'default' },
  'pressure-drop': { gas: 'O2', flow_L_min: 500, tube: '22x0.9', length_m: 50 },
  headroom: {
    gas: 'O2',
    flow_per_patient_L_min: 40,
    site: { current_flow_L_min: 300, limits: [{ kind: 'vaporiser', name: 'VIE', rating_m3_h: 60 }] },
    zones: [{ name: 'Ward 7', current_flow_L_min: 50.5, limits: [{ kind: 'pipe_run', name: 'branch', tube: '15x0.7', length_m: 60 }] }],
  },
  'manifold-sizing': { flow_L_min: 201, hours_per_day: 10, cylinder_free_gas_L: 6800 },
  'reserve-check': { design_flow_L_min: 201, average_daily_consumption_L: 120600, reserve_free_gas_L: 50000 },
  'simultaneous-use': { outlets: 20, use_probability: 0.1, confidence: 0.95, flow_per_outlet_L_min: 10 },
};

const RUNS = Number(process.env.CALC_PROPERTY_RUNS ?? 100); // per generator, so about 200 inputs per verb

type Path = (string | number)[];

/** Every path into a JSON value (objects and arrays), the root excluded. */
function pathsOf(value: unknown, prefix: Path = []): Path[] {
  if (value === null || typeof value !== 'object') return [];
  const entries: [string | number, unknown][] = Array.isArray(value) ? value.map((v, i) => [i, v]) : Object.entries(value);
  return entries.flatMap(([k, v]) => [[...prefix, k], ...pathsOf(v, [...prefix, k])]);
}

const REMOVE = Symbol('remove');

/** A deep copy of `value` with the value at `path` replaced (or the key removed). */
function replaceAt(value: unknown, path: Path, next: unknown): unknown {
  const copy = structuredClone(value) as Record<string | number, unknown>;
  let parent: Record<string | number, unknown> = copy;
  for (const k of path.slice(0, -1)) parent = parent[k] as Record<string | number, unknown>;
  const last = path[path.length - 1];
  if (next === REMOVE) {
    if (Array.isArray(parent)) parent.splice(Number(last), 1);
    else delete parent[last];
  } else parent[last] = next;
  return copy;
}

/** Values a person or a script might send in place of a good one (JSON only: no NaN or Infinity on the wire). */
const nearMiss = fc.oneof(
  fc.constant(REMOVE),
  fc.constant(null),
  fc.double({ noNaN: true, noDefaultInfinity: true }),
  fc.integer(),
  fc.constantFrom(0, -0, -1, 1e-300, 1e300, 1e308, -1e308, Number.MAX_VALUE, Number.MIN_VALUE, Number.MAX_SAFE_INTEGER, 2 ** 31 - 1, -273.15, -274, 1e6),
  fc.string({ maxLength: 12 }),
  fc.constantFrom('', '200', 'O2', 'AIR', 'CO2', 'N2O', 'HE', 'VAC', '2027-02-30T00:00', 'Mars/Olympus', '__proto__', 'constructor', 'toString'),
  fc.boolean(),
  fc.jsonValue({ maxDepth: 2 }),
);

/**
 * Every number anywhere in an answer, with its path, that is not finite (NaN and ±Infinity become
 * `null` in JSON, so the check runs on the answer itself, before serialisation).
 */
function nonFiniteNumbers(value: unknown, path = ''): string[] {
  if (typeof value === 'number') return Number.isFinite(value) ? [] : [`${path || '(root)'} = ${value}`];
  if (value === null || typeof value !== 'object') return [];
  const entries: [string | number, unknown][] = Array.isArray(value) ? value.map((v, i) => [i, v]) : Object.entries(value);
  return entries.flatMap(([k, v]) => nonFiniteNumbers(v, path ? `${path}.${k}` : String(k)));
}

function findInternalError(value: unknown): boolean {
  if (value === null || typeof value !== 'object') return false;
  if ((value as { code?: unknown }).code === 'internal_error') return true;
  return Object.values(value).some(findInternalError);
}

/** Runs a verb: a refusal must be InvalidInputError with a message; an answer must be JSON without internal errors. */
function check(verb: string, input: unknown): void {
  let out: unknown;
  try {
    out = calcVerbs[verb](input);
  } catch (e) {
    if (e instanceof InvalidInputError) {
      expect(e.message.length).toBeGreaterThan(0);
      return;
    }
    throw new Error(`${verb} threw ${(e as Error)?.name}: ${(e as Error)?.message} for input ${JSON.stringify(input)}`);
  }
  const text = JSON.stringify(out);
  expect(typeof text, `${verb} answered with something that is not JSON`).toBe('string');
  expect(findInternalError(out), `${verb} reported an internal error for ${JSON.stringify(input)}: ${text.slice(0, 400)}`).toBe(false);
  expect(nonFiniteNumbers(out), `${verb} answered with a number that is not finite for ${JSON.stringify(input)}`).toEqual([]);
  expect(findPerItemError(out), `${verb} answered (exit 0) with an error inside its answer for ${JSON.stringify(input)}: ${text.slice(0, 400)}`).toBe(false);
}

/** An `error` object inside an answer: bad input must be refused as a whole (exit 2 / 400), not answered. */
function findPerItemError(value: unknown): boolean {
  if (value === null || typeof value !== 'object') return false;
  if (Object.hasOwn(value, 'error')) return true;
  return Object.values(value).some(findPerItemError);
}

describe('calc verbs: extreme inputs found by mutation are refused, not answered with null or absurd figures', () => {
  const refuses = (verb: string, input: unknown, path: string) => {
    let error: unknown = null;
    try {
      calcVerbs[verb](input);
    } catch (e) {
      error = e;
    }
    expect(error, `${verb} answered ${JSON.stringify(input)}`).toBeInstanceOf(InvalidInputError);
    expect((error as InvalidInputError).details.map((d) => d.path)).toContain(path);
  };
  it('a 1e308 L cylinder, a 1e-300 L/min flow, a 1e-300 mm bore', () => {
    refuses('contents', { gas: 'O2', water_capacity_L: 1e308, gauge_bar: 200, temperature_C: 15 }, 'water_capacity_L');
    refuses('duration', { gas: 'O2', water_capacity_L: 10, gauge_bar: 200, temperature_C: 15, flow_L_min: 1e-300 }, 'flow_L_min');
    refuses('pressure-drop', { gas: 'O2', flow_L_min: 500, inner_diameter_mm: 1e-300, length_m: 50 }, 'inner_diameter_mm');
    refuses('manifold-sizing', { flow_L_min: 201, hours_per_day: 10, cylinder_free_gas_L: 1e308 }, 'cylinder_free_gas_L');
    refuses('reserve-check', { design_flow_L_min: 1e-300, average_daily_consumption_L: 120600 }, 'design_flow_L_min');
  });

  it('the verb table refuses an answer that is not finite (the last guard)', () => {
    expect(() => finiteOrRefused(() => ({ a: [1, Infinity] }))(null)).toThrow(InvalidInputError);
    expect(() => finiteOrRefused(() => ({ a: Number.NaN }))(null)).toThrow(/not a finite number \(a\)/);
    expect(finiteOrRefused(() => ({ a: [1, null] }))(null)).toEqual({ a: [1, null] });
    expect(Object.keys(guardedVerbs).sort()).toEqual(Object.keys(calcVerbs).sort());
  });
});

describe('calc verbs under arbitrary input (property-based)', () => {
  it('has a worked example for every verb of the verb table', () => {
    expect(Object.keys(EXAMPLES).sort()).toEqual(Object.keys(guardedVerbs).sort());
  });

  for (const verb of Object.keys(calcVerbs).sort()) {
    describe(verb, () => {
      const example = EXAMPLES[verb];

      it('computes its worked example without refusing it', () => {
        expect(() => calcVerbs[verb](example)).not.toThrow();
        check(verb, example);
      });

      it('arbitrary JSON: an answer or InvalidInputError, nothing else', () => {
        fc.assert(
          fc.property(fc.jsonValue({ maxDepth: 4 }), (input) => check(verb, input)),
          { numRuns: RUNS, seed: 20270104 },
        );
      });

      it('the worked example with one field changed or removed: an answer or InvalidInputError', () => {
        const paths = pathsOf(example);
        fc.assert(
          fc.property(fc.constantFrom(...paths), nearMiss, (path, next) => check(verb, replaceAt(example, path, next))),
          { numRuns: RUNS, seed: 20270105 },
        );
      }, 60_000);
    });
  }
});
