import { describe, expect, it } from 'vitest';
import { createManifoldState, projectManifold, stepManifold, type ManifoldConfig, type ManifoldEvent } from './manifold';

// worked example WE-3 (HTM 02-01 method as quoted in a 2018 military-hospital cylinder calculation): a ward drawing 201 L/min needs a 2 × 10 manifold of
// 47 L / 137 bar cylinders holding about 6,800 L each (HTM 02-01 Part A Table 22).
const CYL_L = 6800;
const RATE_L_H = 201 * 60; // 12,060 L/h

describe('stepManifold', () => {
  it('changes over to the standby bank when the duty bank is exhausted (WE-3 manifold, 201 L/min)', () => {
    const config: ManifoldConfig = { cylindersPerBank: 10, fullCylinderL: CYL_L, residualPerCylinderL: 0, bankReplacementHours: 0 };
    const state = createManifoldState(10 * CYL_L, 10 * CYL_L, 10);
    const events: ManifoldEvent[] = [];
    for (let h = 0; h < 12; h++) stepManifold(state, config, RATE_L_H, h, events);
    // Bank A: 68,000 L ÷ 12,060 L/h = 5.6385 h; bank B runs out at 2 × 5.6385 = 11.277 h.
    expect(events[0]).toMatchObject({ kind: 'changeover', bank: 'B' });
    expect(events[0].atHours).toBeCloseTo(68_000 / 12_060, 9);
    expect(events[1]).toMatchObject({ kind: 'supply_lost', bank: 'B' });
    expect(events[1].atHours).toBeCloseTo(136_000 / 12_060, 9);
  });

  it('changes over earlier when gas is left behind at the changeover pressure', () => {
    // Residual 500 L per cylinder: usable bank = 10 × (6,800 − 500) = 63,000 L → changeover at 5.2239 h.
    const config: ManifoldConfig = { cylindersPerBank: 10, fullCylinderL: CYL_L, residualPerCylinderL: 500, bankReplacementHours: 0 };
    const state = createManifoldState(10 * CYL_L, 10 * CYL_L, 10);
    const events: ManifoldEvent[] = [];
    for (let h = 0; h < 6; h++) stepManifold(state, config, RATE_L_H, h, events);
    expect(events[0].atHours).toBeCloseTo(63_000 / 12_060, 9);
  });
});

describe('projectManifold', () => {
  it('replaces the exhausted bank from the store and keeps supplying until the store is used up', () => {
    // 2 × 5 cylinders of 3,400 L at 1,000 L/h; 10 spare cylinders; replacement 2 h after a changeover.
    // A empties at 17 h → B; A refilled at 19 h (5 spares); B empties at 34 h → A; B refilled at 36 h
    // (last 5 spares); A empties at 51 h → B; with the store empty A stays exhausted, so supply is lost
    // when B empties at 68 h: 4 banks × 17,000 L = 68,000 L ÷ 1,000 L/h.
    const config: ManifoldConfig = { cylindersPerBank: 5, fullCylinderL: 3400, residualPerCylinderL: 0, bankReplacementHours: 2 };
    const r = projectManifold({ config, dutyBankL: 17_000, standbyBankL: 17_000, spareFull: 10, demandPerHour: new Float64Array(100).fill(1000) });
    expect(r.changeoverHours.map((h) => Math.round(h * 1e6) / 1e6)).toEqual([17, 34, 51]);
    const replaced = r.events.filter((e) => e.kind === 'bank_replaced');
    expect(replaced.map((e) => [e.bank, e.atHours, e.cylinders])).toEqual([
      ['A', 19, 5],
      ['B', 36, 5],
    ]);
    expect(r.hoursToEmpty).toBeCloseTo(68, 9);
    // Usable contents fall linearly by 1,000 L/h while supply lasts.
    expect(r.series[9]).toBeCloseTo(68_000 - 10_000, 6);
    expect(r.series[99]).toBe(0);
  });

  it('orders cylinders to the store by the reorder rule so supply never stops', () => {
    const config: ManifoldConfig = { cylindersPerBank: 5, fullCylinderL: 3400, residualPerCylinderL: 0, bankReplacementHours: 0 };
    const r = projectManifold({
      config,
      dutyBankL: 17_000,
      standbyBankL: 17_000,
      demandPerHour: new Float64Array(200).fill(1000),
      reorder: { levelCylinders: 4, orderUpToCylinders: 15, leadTimeHours: 6 },
    });
    // 10 cylinder-equivalents (34,000 L) fall to 4 (13,600 L) at 20.4 h → order at boundary 21,
    // arrives at 27 h with 34,000 − 27,000 = 7,000 L = 2.06 equivalents → floor(15 − 2.06) = 12 cylinders.
    expect(r.orders[0]).toMatchObject({ placedHours: 21, arrivesHours: 27, quantity: 12 });
    expect(r.hoursToEmpty).toBeNull();
  });
});
