import { InvalidInputError } from '../api/errors';

/**
 * Reorder point of the classic order-point rule: mean daily use × (lead time + safety stock), both in days
 * (any consistent unit of quantity: kg, litres of liquid, cylinders). This is the arithmetic of the VIE
 * worked example in the trade notes: (2 days lead + 3 days safety) × 143 L LOX/day = 715 L. The safety
 * margin is the site's choice; supplier lead times vary from hours to days.
 * @param meanDailyUse quantity per day (≥ 0)
 * @param leadTimeDays delivery lead time, days (≥ 0)
 * @param safetyStockDays safety stock expressed as days of mean use (≥ 0)
 */
export function computeReorderPoint(meanDailyUse: number, leadTimeDays: number, safetyStockDays: number): number {
  if (!(meanDailyUse >= 0 && leadTimeDays >= 0 && safetyStockDays >= 0)) {
    throw new InvalidInputError('The reorder point needs use, lead time and safety stock ≥ 0', [
      { path: 'reorder_point', message: 'use, lead time and safety stock must be ≥ 0' },
    ]);
  }
  return meanDailyUse * (leadTimeDays + safetyStockDays);
}
