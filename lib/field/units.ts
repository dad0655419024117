// Display of figures in the unit the engineer chose. Stored values are always °C and kW; a value
// that is missing or not finite shows as a dash, never as NaN.
import { cToF } from '../combustion';

export type TempDisplayUnit = 'C' | 'F';
export type PowerDisplayUnit = 'kW' | 'Btu/h';

export const BTU_PER_H_PER_KW = 3412.14;

export function isUsable(value: number | null | undefined): value is number {
  return typeof value === 'number' && Number.isFinite(value);
}

export function formatFixed(value: number | null | undefined, decimals: number): string {
  return isUsable(value) ? value.toFixed(decimals) : '—';
}

export function formatTemp(tempC: number | null | undefined, unit: TempDisplayUnit): string {
  if (!isUsable(tempC)) return '—';
  return unit === 'F' ? `${cToF(tempC).toFixed(0)} °F` : `${tempC.toFixed(0)} °C`;
}

/** A stored °C figure in the unit shown in a form field (blank when missing). */
export function tempForInput(tempC: number | null, unit: TempDisplayUnit): string {
  if (!isUsable(tempC)) return '';
  return unit === 'F' ? String(Number(cToF(tempC).toFixed(1))) : String(Number(tempC.toFixed(1)));
}

export function formatPower(kw: number | null | undefined, unit: PowerDisplayUnit): string {
  if (!isUsable(kw)) return '—';
  return unit === 'Btu/h' ? `${Math.round(kw * BTU_PER_H_PER_KW).toLocaleString('en-GB')} Btu/h` : `${kw.toFixed(2)} kW`;
}

/** The CO/CO2 ratio as written in the trade: 0.0040, never a percentage; small ones keep two significant figures. */
export function formatRatio(ratio: number | null | undefined): string {
  if (!isUsable(ratio)) return '—';
  return Math.abs(ratio) < 0.001 ? ratio.toFixed(5) : ratio.toFixed(4);
}
