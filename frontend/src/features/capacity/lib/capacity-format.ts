import { CAPACITY_GAS_LABELS, DEPARTMENT_LABELS } from '@common/schemas/capacity.schema';
import type { LimitOut } from '@common/schemas/capacity.schema';
import { DASH, formatNumber } from '@/lib/format';
import type { Tone } from '@/components/ui/badge';

/** Words for the capacity screen and its printed report. */

export function gasLabel(code: string): string {
  return (CAPACITY_GAS_LABELS as Record<string, string>)[code] ?? code;
}

export function departmentLabel(code: string): string {
  return (DEPARTMENT_LABELS as Record<string, string>)[code] ?? code.replace(/_/g, ' ');
}

export const LIMIT_KIND_LABELS: Record<LimitOut['kind'], string> = {
  manifold_regulator: 'Regulator',
  vaporiser: 'Vaporiser (derated)',
  pipe_run: 'Pipe run',
  other: 'Other limit',
};

export const SOURCE_TYPE_LABELS: Record<string, string> = {
  bulk_liquid: 'Bulk liquid tank',
  manifold: 'Cylinder manifold',
  cylinder_store: 'Cylinder store',
  emergency_reserve: 'Emergency reserve',
};

export const COUNT_LABELS: Record<string, string> = {
  terminal_unit: 'terminal units',
  bed: 'beds',
  room: 'rooms',
  trolley_space: 'trolley spaces',
  occupant: 'occupants',
};

export function formatFlow(lMin: number | null | undefined): string {
  if (lMin === null || lMin === undefined || !Number.isFinite(lMin)) return DASH;
  return `${formatNumber(lMin, lMin < 100 ? 1 : 0)} L/min`;
}

export function formatPercent(fraction: number | null | undefined, digits = 0): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return DASH;
  return `${formatNumber(fraction * 100, digits)} %`;
}

export function formatHours(h: number | null | undefined): string {
  if (h === null || h === undefined || !Number.isFinite(h)) return DASH;
  if (h >= 48) return `${formatNumber(h / 24, 1)} days`;
  return `${formatNumber(h, 1)} h`;
}

/**
 * How close a flow is to a limit, in the screen's colours: over the limit is critical; from 80 % the
 * margin is thin (a surge of a few patients takes it); from 60 % worth watching.
 */
export function utilisationTone(fraction: number | null | undefined): Tone {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return 'neutral';
  if (fraction > 1) return 'critical';
  if (fraction >= 0.8) return 'warn';
  if (fraction >= 0.6) return 'watch';
  return 'ok';
}

export function patientsPhrase(n: number | null | undefined, flowLMin: number): string {
  if (n === null || n === undefined) return 'no limit known';
  if (n === 0) return `no more patients at ${formatNumber(flowLMin)} L/min`;
  return `${formatNumber(n)} more ${n === 1 ? 'patient' : 'patients'} at ${formatNumber(flowLMin)} L/min`;
}
