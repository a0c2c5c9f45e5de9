import { describe, expect, it } from 'vitest';
import { forecastInputSchema } from './forecast-input.schema';
import { forecastSource } from './forecast-source';
import { freeGasLitresPerKg } from '../gas/reference-conditions';

const forecast = (raw: unknown) => forecastSource(forecastInputSchema.parse(raw));
const base = { start: '2027-01-04T00:00', timezone: 'Europe/London', horizon_days: 10, reference: '15C', demand: [{ flow_L_min: 100 }] };

describe('forecastSource: the reorder level it plans against (the chart line)', () => {
  it('a bulk tank with a level in kg, in percent of capacity and in days of stock', () => {
    const tank = {
      type: 'bulk_liquid',
      gas: 'O2',
      capacity_kg: 10_000,
      contents_kg: 6000,
      evaporation_percent_per_day: 0,
      lead_time_hours: 48,
      order_up_to_kg: 9000,
    };
    expect(forecast({ ...base, source: { ...tank, reorder_level_kg: 2500 } }).reorderLevel).toBe(2500);
    // 30 % of a 10,000 kg tank = 3,000 kg (hand calculation).
    expect(forecast({ ...base, source: { ...tank, reorder_level_percent: 30 } }).reorderLevel).toBeCloseTo(3000, 9);
    // 2 days at 100 L/min: 2 × 1440 × 100 L ÷ (L/kg of O2 at 15 °C, reference EOS) = 288,000 / 738.4 ≈ 390.1 kg.
    const days = forecast({ ...base, source: { ...tank, contents_kg: 1000, reorder_level_days: 2 } });
    expect(days.reorderLevel!).toBeCloseTo(288_000 / freeGasLitresPerKg('O2', '15C'), 6);
    expect(days.reorderLevel!).toBeCloseTo(390.1, 0);
    // From 1,000 kg at 8.126 kg/h the level is crossed in the hour ending ceil(609.9 / 8.126) = 76 h after the
    // start: the first order is placed there, so the line and the order agree.
    expect(days.orders[0].placedHours).toBe(76);
    const i = days.orders[0].placedHours;
    expect(days.series[i - 1]).toBeLessThanOrEqual(days.reorderLevel!);
    expect(days.series[i - 2]).toBeGreaterThan(days.reorderLevel!);
  });

  it('no reorder rule: no line', () => {
    const f = forecast({ ...base, source: { type: 'bulk_liquid', gas: 'O2', capacity_kg: 10_000, contents_kg: 6000, lead_time_hours: 48 } });
    expect(f.reorderLevel).toBeNull();
  });

  it('a cylinder store: the level in cylinders × usable gas per cylinder (above the stated residual)', () => {
    const f = forecast({
      ...base,
      source: {
        type: 'cylinders',
        gas: 'O2',
        water_capacity_L: 47,
        fill_gauge_bar: 137,
        fill_temperature_C: 15,
        full: 10,
        in_use_gauge_bar: [],
        reorder_level_cylinders: 4,
        order_up_to_cylinders: 12,
        lead_time_hours: 24,
      },
    });
    const perCyl = f.factors.fullCylinderFreeGasL!;
    // HTM 02-01 Part A Table 22: a 47 L cylinder at 137 bar holds about 6,800 L of O2 (nominal figure).
    expect(Math.abs(perCyl / 6800 - 1)).toBeLessThan(0.05);
    // Store contents count usable gas (each cylinder is changed at its residual, 10 % of the fill by default).
    const usable = f.factors.usablePerCylinderL!;
    expect(usable).toBeLessThan(perCyl);
    expect(f.reorderLevel!).toBeCloseTo(4 * usable, 6);
  });

  it('a manifold: full-cylinder equivalents of usable gas (above the changeover residual)', () => {
    const f = forecast({
      ...base,
      source: {
        type: 'manifold',
        gas: 'O2',
        water_capacity_L: 47,
        fill_gauge_bar: 137,
        fill_temperature_C: 15,
        cylinders_per_bank: 5,
        duty_bank_gauge_bar: 137,
        standby_bank_gauge_bar: 137,
        spare_full: 10,
        changeover_gauge_bar: 10,
        reorder_level_cylinders: 6,
        order_up_to_cylinders: 15,
        lead_time_hours: 24,
      },
    });
    const usable = f.factors.fullCylinderFreeGasL! - f.factors.residualPerCylinderL!;
    // The residual at a 10 bar changeover is about 10/137 of a full cylinder (near-ideal at low pressure).
    expect(f.factors.residualPerCylinderL! / f.factors.fullCylinderFreeGasL!).toBeCloseTo(10 / 137, 1);
    expect(f.reorderLevel!).toBeCloseTo(6 * usable, 6);
    const i = f.orders[0].placedHours;
    expect(f.series[i - 1]).toBeLessThanOrEqual(f.reorderLevel! + 1e-6);
    expect(f.series[i - 2]).toBeGreaterThan(f.reorderLevel!);
  });
});
