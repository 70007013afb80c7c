import type { MeterRow } from '../../../../shared/schemas/machines';
import type { ShopFormat } from '../../../lib/format';

const DECIMAL_UNITS = new Set(['h', 'mm', 'bar', 'kPa', '°C']);

/** A value with its unit, always: a bare number on a shop floor is an invitation to guess. */
export function formatValue(f: ShopFormat, value: number, unit: string): string {
  return `${f.number(value, { max: DECIMAL_UNITS.has(unit) ? 1 : 0 })} ${unit}`;
}

/** 'Above the upper limit' / 'Below the lower limit' for condition meters, else null. */
export function limitState(f: ShopFormat, m: Pick<MeterRow, 'lowerLimit' | 'upperLimit' | 'unit'>, value: number): string | null {
  if (m.upperLimit !== null && value > m.upperLimit) return `Above limit ${formatValue(f, m.upperLimit, m.unit)}`;
  if (m.lowerLimit !== null && value < m.lowerLimit) return `Below limit ${formatValue(f, m.lowerLimit, m.unit)}`;
  return null;
}
