import { DateTime } from 'luxon';

/**
 * Formatting for people: numbers, volumes, pressures, durations, money and dates. Every function
 * returns an en dash for a value that is missing or not finite, so NaN never reaches the screen.
 */

export const DASH = '–';
const LOCALE = 'en-GB';

function finite(n: number | null | undefined): n is number {
  return typeof n === 'number' && Number.isFinite(n);
}

export function formatNumber(n: number | null | undefined, maximumFractionDigits = 0, minimumFractionDigits = 0): string {
  if (!finite(n)) return DASH;
  return new Intl.NumberFormat(LOCALE, { maximumFractionDigits, minimumFractionDigits: Math.min(minimumFractionDigits, maximumFractionDigits) }).format(n);
}

/** Significant figures, for quantities that range over orders of magnitude. */
export function formatSignificant(n: number | null | undefined, digits = 3): string {
  if (!finite(n)) return DASH;
  return new Intl.NumberFormat(LOCALE, { maximumSignificantDigits: digits }).format(n);
}

export function formatLitres(l: number | null | undefined): string {
  if (!finite(l)) return DASH;
  return `${formatNumber(l, l < 100 ? 1 : 0)} L`;
}

export function formatKg(kg: number | null | undefined): string {
  if (!finite(kg)) return DASH;
  return `${formatNumber(kg, kg < 100 ? 2 : 0)} kg`;
}

/** Minutes → "3 h 25 min", "45 min", "2 d 4 h". */
export function formatDurationMinutes(minutes: number | null | undefined): string {
  if (!finite(minutes)) return DASH;
  if (minutes < 0) return DASH;
  if (minutes < 1) return 'under 1 min';
  const total = Math.floor(minutes);
  const days = Math.floor(total / 1440);
  const hours = Math.floor((total % 1440) / 60);
  const mins = total % 60;
  if (days > 0) return hours > 0 ? `${days} d ${hours} h` : `${days} d`;
  if (hours > 0) return mins > 0 ? `${hours} h ${mins} min` : `${hours} h`;
  return `${mins} min`;
}

export function formatDays(days: number | null | undefined): string {
  if (!finite(days)) return DASH;
  if (days < 1) return `${formatNumber(days * 24, 0)} h`;
  return `${formatNumber(days, days < 10 ? 1 : 0)} ${days === 1 ? 'day' : 'days'}`;
}

/** Integer minor units (pence, cents) in the site's currency. */
export function formatMoney(minor: number | null | undefined, currency: string): string {
  if (!finite(minor)) return DASH;
  try {
    const fmt = new Intl.NumberFormat(LOCALE, { style: 'currency', currency });
    const digits = fmt.resolvedOptions().maximumFractionDigits ?? 2;
    return fmt.format(minor / 10 ** digits);
  } catch {
    return `${formatNumber(minor / 100, 2, 2)} ${currency}`;
  }
}

/** Minor units a currency has (2 for GBP, 0 for JPY). */
export function currencyMinorDigits(currency: string): number {
  try {
    return new Intl.NumberFormat(LOCALE, { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2;
  } catch {
    return 2;
  }
}

export function formatBytes(bytes: number | null | undefined): string {
  if (!finite(bytes)) return DASH;
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${formatNumber(bytes / 1024, 1)} kB`;
  return `${formatNumber(bytes / (1024 * 1024), 1)} MB`;
}

/** ISO instant → "2 Dec 2026, 14:05" in the given zone (the site's, or the browser's). */
export function formatDateTime(iso: string | null | undefined, timeZone?: string): string {
  if (!iso) return DASH;
  const dt = DateTime.fromISO(iso, { zone: 'utc' }).setZone(timeZone ?? 'local');
  return dt.isValid ? dt.setLocale(LOCALE).toFormat('d LLL yyyy, HH:mm') : DASH;
}

/** ISO instant → "Wed 9 Dec" in the given zone. */
export function formatDay(iso: string | null | undefined, timeZone?: string): string {
  if (!iso) return DASH;
  const dt = DateTime.fromISO(iso, { zone: 'utc' }).setZone(timeZone ?? 'local');
  return dt.isValid ? dt.setLocale(LOCALE).toFormat('ccc d LLL') : DASH;
}

/** "in 3 days", "2 hours ago". */
export function formatRelative(iso: string | null | undefined): string {
  if (!iso) return DASH;
  const dt = DateTime.fromISO(iso);
  if (!dt.isValid) return DASH;
  if (Math.abs(dt.diffNow('seconds').seconds) < 60) return 'just now';
  return dt.setLocale(LOCALE).toRelative() ?? DASH;
}
