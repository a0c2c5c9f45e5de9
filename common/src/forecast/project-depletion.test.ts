import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { freeGasLitresPerKg } from '../gas/reference-conditions';
import { daysOfStock, projectDepletion, type DepletionModel } from './project-depletion';

// O2 density at 15 °C and 1.01325 bar from the tests/reference/README.md (Schmidt & Wagner 1985 EOS).
const referenceReadme = readFileSync(new URL('../../../tests/reference/README.md', import.meta.url), 'utf8');
const RHO_O2_15C = Number(/ρ\(O2\) = ([\d.]+) kg\/m³/.exec(referenceReadme)![1]);

const flat = (hours: number, perHour: number) => new Float64Array(hours).fill(perHour);

function model(partial: Partial<DepletionModel> & { demandPerHour: Float64Array }): DepletionModel {
  return { contentsStart: 0, capacity: Infinity, evaporationPerHour: 0, ...partial };
}

describe('projectDepletion: constant demand', () => {
  it('empties a 1,000 kg O2 tank at 100 L/min in 1000 / (6000 / 738.36) = 123.06 h', () => {
    expect(RHO_O2_15C).toBe(1.35436);
    // Free gas per kg = 1000 L/m³ ÷ 1.35436 kg/m³ = 738.356 L/kg (reference density, tests/reference).
    const lPerKgReference = 1000 / RHO_O2_15C;
    const lPerKg = freeGasLitresPerKg('O2', '15C');
    // The gas engine's real-gas value must agree with the reference density within 0.1 %.
    expect(Math.abs(lPerKg / lPerKgReference - 1)).toBeLessThan(1e-3);
    // 100 L/min × 60 = 6,000 L/h ÷ 738.356 L/kg = 8.1262 kg/h; 1,000 kg ÷ 8.1262 = 123.059 h.
    const kgPerHour = 6000 / lPerKg;
    const r = projectDepletion(model({ contentsStart: 1000, capacity: 10_000, demandPerHour: flat(200, kgPerHour) }));
    expect(r.hoursToEmpty).toBeCloseTo((1000 * lPerKg) / 6000, 9);
    expect(r.hoursToEmpty!).toBeCloseTo(123.06, 1);
    // Linear series: after 10 h, 1000 − 81.26 kg.
    expect(r.series[9]).toBeCloseTo(1000 - 10 * kgPerHour, 9);
    expect(r.series[199]).toBe(0);
    // Days of stock: 1,000 kg ÷ (8.1262 × 24 = 195.03 kg/day) = 5.127 days.
    expect(r.daysOfStockAtStart!).toBeCloseTo(1000 / (kgPerHour * 24), 9);
  });

  it('interpolates the empty instant within the hour: 5 units at 2 per hour → 2.5 h', () => {
    expect(projectDepletion(model({ contentsStart: 5, demandPerHour: flat(10, 2) })).hoursToEmpty).toBe(2.5);
  });

  it('reports null when the source outlasts the horizon and 0 when it starts empty', () => {
    expect(projectDepletion(model({ contentsStart: 100, demandPerHour: flat(10, 1) })).hoursToEmpty).toBeNull();
    expect(projectDepletion(model({ contentsStart: 0, demandPerHour: flat(10, 1) })).hoursToEmpty).toBe(0);
  });

  it('never lets contents go below zero (property)', () => {
    fc.assert(
      fc.property(
        fc.float({ min: 0, max: 1000, noNaN: true }),
        fc.array(fc.float({ min: 0, max: 50, noNaN: true }), { minLength: 1, maxLength: 100 }),
        (c0, d) => {
          const r = projectDepletion(model({ contentsStart: c0, demandPerHour: Float64Array.from(d) }));
          return r.series.every((v) => v >= 0);
        },
      ),
    );
  });
});

describe('projectDepletion: evaporation', () => {
  it('loses the larger of demand and boil-off: a tank with boil-off above demand empties at the boil-off rate', () => {
    // 10,000 kg tank at 1 %/day boil-off = 100 kg/day = 4.1667 kg/h; demand 1 kg/h < boil-off, so the
    // loss is 4.1667 kg/h (the excess vents): 500 kg last 500 ÷ 4.1667 = 120 h.
    const evap = (0.01 * 10_000) / 24;
    const r = projectDepletion(model({ contentsStart: 500, capacity: 10_000, evaporationPerHour: evap, demandPerHour: flat(200, 1) }));
    expect(r.hoursToEmpty).toBeCloseTo(120, 9);
    // Days of stock count the boil-off: 500 ÷ 100 kg/day = 5 days.
    expect(r.daysOfStockAtStart).toBeCloseTo(5, 9);
  });

  it('counts demand only when demand exceeds boil-off (boil-off feeds the pipeline)', () => {
    // Demand 10 kg/h > 4.1667 kg/h boil-off: 500 kg last 50 h.
    const r = projectDepletion(model({ contentsStart: 500, capacity: 10_000, evaporationPerHour: 100 / 24, demandPerHour: flat(200, 10) }));
    expect(r.hoursToEmpty).toBeCloseTo(50, 9);
  });
});

describe('projectDepletion: deliveries', () => {
  it('adds a scheduled delivery at its boundary: 100 + 50 units at 10 per hour last 15 h', () => {
    const r = projectDepletion(model({ contentsStart: 100, capacity: 1000, demandPerHour: flat(30, 10), deliveries: [{ boundary: 5, amount: 50 }] }));
    // Boundary 5: 100 − 5 × 10 = 50, + 50 = 100; then 10 more hours.
    expect(r.series[4]).toBe(50);
    expect(r.series[5]).toBe(90);
    expect(r.hoursToEmpty).toBe(15);
  });

  it('never fills above capacity', () => {
    const r = projectDepletion(model({ contentsStart: 900, capacity: 1000, demandPerHour: flat(5, 10), deliveries: [{ boundary: 1, amount: 500 }] }));
    // Boundary 1: 890 + 500 → capped at 1,000; end of hour 1: 990.
    expect(r.series[1]).toBe(990);
  });
});

describe('projectDepletion: reorder rule', () => {
  it('places an order when the level is crossed and fills to order-up-to on arrival', () => {
    // 1,000 kg at 10 kg/h crosses 500 kg at boundary 50 → order placed at 50 h, arrives at 74 h with
    // 1,000 − 740 = 260 kg left → quantity 900 − 260 = 640 kg.
    const r = projectDepletion(
      model({ contentsStart: 1000, capacity: 2000, demandPerHour: flat(120, 10), reorder: { level: 500, orderUpTo: 900, leadTimeHours: 24, lotSize: 0 } }),
    );
    expect(r.firstOrderHours).toBe(50);
    expect(r.orders[0]).toMatchObject({ placedHours: 50, arrivesHours: 74, arrivalBoundary: 74, quantity: 640, amount: 640 });
    expect(r.series[73]).toBe(260);
    expect(r.series[74]).toBe(890);
    // Second order: 900 → 500 takes 40 h: placed at 114 h, after the horizon → quantity unknown.
    expect(r.orders[1]).toMatchObject({ placedHours: 114, quantity: null });
    expect(r.hoursToEmpty).toBeNull();
    expect(r.firstRisk).toBeNull();
  });

  it('orders whole cylinders: floor(order-up-to − full-cylinder equivalents)', () => {
    // 10 cylinders × 3,400 L at 680 L/h; level 4 cylinders (13,600 L) is reached at boundary 30
    // (34,000 − 30 × 680 = 13,600); lead 10 h → at arrival 6,800 L = 2.0 equivalents → 12 − 2 = 10 cylinders.
    const per = 3400;
    const r = projectDepletion(
      model({ contentsStart: 10 * per, demandPerHour: flat(60, 680), reorder: { level: 4 * per, orderUpTo: 12 * per, leadTimeHours: 10, lotSize: per } }),
    );
    expect(r.orders[0]).toMatchObject({ placedHours: 30, arrivesHours: 40, quantity: 10, amount: 34_000 });
    expect(r.series[40]).toBe(6800 + 34_000 - 680);
  });

  it('lands a zero-lead order at once', () => {
    const r = projectDepletion(
      model({ contentsStart: 100, capacity: 100, demandPerHour: flat(20, 10), reorder: { level: 50, orderUpTo: 100, leadTimeHours: 0, lotSize: 0 } }),
    );
    // 100 → 50 at boundary 5: refilled to 100 in the same instant.
    expect(r.orders[0]).toMatchObject({ placedHours: 5, quantity: 50 });
    expect(r.series[5]).toBe(90);
    expect(r.hoursToEmpty).toBeNull();
  });

  it('flags a reorder level that leaves less than the lead time before empty', () => {
    // Level 100 at 10/h leaves 10 h of stock; lead time 24 h → empty at 90 + 10 = 100 h, before arrival at 114 h.
    const r = projectDepletion(
      model({ contentsStart: 1000, demandPerHour: flat(200, 10), reorder: { level: 100, orderUpTo: 1000, leadTimeHours: 24, lotSize: 0 } }),
    );
    expect(r.hoursToEmpty).toBe(100);
    expect(r.firstRisk).toMatchObject({ kind: 'empty_before_delivery', atHours: 90 });
  });

  it('WE-4: a 10,000 L VIE drawn at 120,600 L/day goes 80 % → 20 % in ~42 days; reorder point (2 + 3) × 143 = 715 L LOX', () => {
    // worked example WE-4, hand calculation: 120,600 L/day ÷ 842 L gas per L LOX (15 °C) = 143 L LOX/day; a 0.5 %/day NER
    // on 10,000 L is 50 L/day, below demand, so nothing is lost; 60 % of 10,000 L = 6,000 L ÷ 143 ≈ 42 days.
    // Reorder point = daily use × (lead 2 d + safety 3 d) = 715 L. Work in litres of LOX: the demand is
    // spread evenly over the day (120,600 / 24 L gas per hour), so boil-off stays below demand every hour.
    const lGasPerLLox = 842;
    const loxPerHour = 120_600 / 24 / lGasPerLLox;
    const evapPerHour = (0.005 * 10_000) / 24;
    expect(loxPerHour).toBeGreaterThan(evapPerHour);
    const reorderPointL = Math.round(loxPerHour * 24) * (2 + 3); // the order-point rule: daily use × (lead + safety days)
    expect(Math.round(loxPerHour * 24)).toBe(143);
    expect(reorderPointL).toBe(715);
    const r = projectDepletion(
      model({
        contentsStart: 8000,
        capacity: 10_000,
        evaporationPerHour: evapPerHour,
        demandPerHour: flat(60 * 24, loxPerHour),
        reorder: { level: 2000, orderUpTo: 8000, leadTimeHours: 1e6, lotSize: 0 },
      }),
    );
    // The reorder rule's level is the 20 % mark here: the time to cross it is the 80 % → 20 % time.
    expect(r.firstOrderHours! / 24).toBeCloseTo(6000 / (120_600 / 842), 1);
    expect(Math.round(r.firstOrderHours! / 24)).toBe(42);
    // With the reorder point as the level, the order goes out 715 / 143 = 5 days of use before empty.
    const r2 = projectDepletion(
      model({
        contentsStart: 8000,
        capacity: 10_000,
        evaporationPerHour: evapPerHour,
        demandPerHour: flat(80 * 24, loxPerHour),
        reorder: { level: reorderPointL, orderUpTo: 8000, leadTimeHours: 48, lotSize: 0 },
      }),
    );
    const daysBeforeEmpty = (8000 / loxPerHour - r2.firstOrderHours!) / 24;
    expect(daysBeforeEmpty).toBeCloseTo(715 / (120_600 / 842), 1);
  });
});

describe('projectDepletion: risks', () => {
  it('reports the moment contents fall into the reserve, interpolated within the hour', () => {
    // 100 at 8 per hour reaches the reserve of 30 after (100 − 30) / 8 = 8.75 h.
    const r = projectDepletion(model({ contentsStart: 100, demandPerHour: flat(48, 8), reserveLevel: 30 }));
    expect(r.firstRisk).toMatchObject({ kind: 'reserve_touched' });
    expect(r.firstRisk!.atHours).toBeCloseTo(8.75, 12);
  });

  it('flags a start at or below the reorder level', () => {
    const r = projectDepletion(model({ contentsStart: 40, demandPerHour: flat(48, 1), reorder: { level: 50, orderUpTo: 100, leadTimeHours: 4, lotSize: 0 } }));
    expect(r.firstRisk).toMatchObject({ kind: 'below_reorder_level_at_start', atHours: 0 });
    expect(r.orders[0]).toMatchObject({ placedHours: 0, arrivesHours: 4, quantity: 64 });
  });
});

describe('daysOfStock', () => {
  it('divides by the mean loss of the first 7 days only', () => {
    // 24 h at 10/h then 0: first 7 days average 240 / 7 per day → 240 units = 7 days of stock.
    const d = new Float64Array(400);
    d.fill(10, 0, 24);
    expect(daysOfStock(model({ contentsStart: 240, demandPerHour: d }))).toBeCloseTo(7, 12);
    expect(daysOfStock(model({ contentsStart: 240, demandPerHour: new Float64Array(10) }))).toBeNull();
  });
});
