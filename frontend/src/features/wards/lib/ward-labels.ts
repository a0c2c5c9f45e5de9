import { GAS_INFO, isGasCode } from '@common/gas/gases';
import { DEVICE_DEFAULTS } from '@common/forecast/demand-model';
import type { Department, Feed, TherapyLine } from '../api/wards-api';

/** Words for the codes of wards, therapy lines and feeds. */

export const DEPARTMENT_LABEL: Record<Department, string> = {
  ward: 'Ward',
  critical_care: 'Critical care',
  theatre: 'Theatres',
  emergency: 'Emergency department',
  recovery: 'Recovery',
  maternity: 'Maternity',
  day_unit: 'Day unit',
  other: 'Other',
};

export const FEED_ROLE_LABEL: Record<Feed['role'], string> = {
  primary: 'Primary',
  secondary: 'Secondary',
  reserve: 'Reserve',
};

export function deviceLabel(device: TherapyLine['device']): string {
  if (device === 'theatre') return 'Theatre (anaesthetic machine)';
  if (device === 'custom') return 'Other flow (enter it)';
  return DEVICE_DEFAULTS[device]?.label ?? device;
}

export function gasName(code: string): string {
  return isGasCode(code) ? GAS_INFO[code].name : code;
}
