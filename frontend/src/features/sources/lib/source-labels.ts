import { GAS_INFO, isGasCode } from '@common/gas/gases';
import { formatNumber } from '@/lib/format';
import type { Reading, Source, SourceType } from '../api/sources-api';

/** Words for the codes of a supply source, shared by the screens of this feature. */

export const SOURCE_TYPE_LABEL: Record<SourceType, string> = {
  bulk_liquid: 'Bulk liquid tank',
  manifold: 'Cylinder manifold',
  cylinder_store: 'Cylinder store',
  emergency_reserve: 'Emergency reserve',
};

export const READING_METHOD_LABEL: Record<Reading['method'], string> = {
  manual: 'Read by hand',
  telemetry: 'Telemetry',
  delivery_note: 'Delivery note',
  import: 'Imported',
};

export const BASIS_LABEL: Record<Source['forecastBasis'], string> = {
  model: 'Modelled demand (therapy lines)',
  measured: 'Measured use (recent readings)',
  scaled: 'Modelled demand × accepted correction',
};

export function gasName(code: string): string {
  return isGasCode(code) ? GAS_INFO[code].name : code;
}

/** The reading as the person took it: "62.4 %", "duty 121 bar · standby 194 bar · 10 spare full". */
export function describeReading(r: Reading, calibrationUnit?: string | null): string {
  const d = r.detail ?? {};
  switch (r.kind) {
    case 'level_percent':
      return `${formatNumber(r.value, 1)} % level`;
    case 'kg':
      return `${formatNumber(r.value, 0)} kg`;
    case 'litres_liquid':
      return `${formatNumber(r.value, 0)} L of liquid`;
    case 'calibration':
      return `Gauge ${formatNumber(r.value, 2)}${calibrationUnit ? ` ${calibrationUnit}` : ''}`;
    case 'bank_gauges':
      return `Duty ${formatNumber(d.dutyBar, 0)} bar · standby ${formatNumber(d.standbyBar, 0)} bar · ${formatNumber(d.spareFull ?? 0)} spare full`;
    case 'store_count': {
      const inUse = d.inUseGaugeBar ?? [];
      const inUseText = inUse.length ? `${inUse.length} in use (${inUse.map((g) => formatNumber(g, 0)).join(', ')} bar)` : 'none in use';
      return `${formatNumber(d.full ?? 0)} full · ${inUseText} · ${formatNumber(d.empty ?? 0)} empty`;
    }
    default:
      return String(r.kind);
  }
}

/** A reorder rule in words: "at 35 % of capacity, up to 9,000 kg". */
export function describeReorderRule(s: Pick<Source, 'type' | 'reorderMode' | 'reorderLevel' | 'orderUpTo'>): string {
  if (s.reorderMode === 'none' || s.reorderLevel === null) return 'No reorder rule';
  const unit = s.type === 'bulk_liquid' ? 'kg' : 'cylinders';
  const at =
    s.reorderMode === 'days'
      ? `${formatNumber(s.reorderLevel, 1)} days of stock`
      : s.reorderMode === 'percent'
        ? `${formatNumber(s.reorderLevel, 1)} %`
        : `${formatNumber(s.reorderLevel)} ${unit}`;
  return `At ${at}, order up to ${formatNumber(s.orderUpTo)} ${unit}`;
}
