/**
 * Mean daily use of one therapy line, L/day of free gas: patients × flow (L/min) × 60 × hours a day ×
 * days a week / 7, plus the ward's leakage allowance. The additive device model of WHO oxygen planning
 * (patients × device flow × time), as the server's demand model computes it.
 * @param patients patients on the line (≥ 0)
 * @param flowLMin flow per patient, L/min
 * @param hours local clock hours the line runs (null or empty: all 24)
 * @param weekdays ISO weekdays it runs (null or empty: all 7)
 * @param leakagePercent the ward's leakage allowance, %
 */
export function lineLitresPerDay(
  patients: number,
  flowLMin: number,
  hours: readonly number[] | null,
  weekdays: readonly number[] | null,
  leakagePercent: number,
): number {
  const h = hours && hours.length ? new Set(hours).size : 24;
  const d = weekdays && weekdays.length ? new Set(weekdays).size : 7;
  return patients * flowLMin * 60 * h * (d / 7) * (1 + leakagePercent / 100);
}
