/**
 * Units of condition readings (pressure, temperature) and conversion between them, so a meter keeps
 * its readings in one unit whatever unit a person or an export uses.
 *
 * Factors: NIST Special Publication 811 (2008 edition), "Guide for the Use of the International
 * System of Units (SI)", Appendix B.8 / B.9 (factors for units listed alphabetically / by kind):
 *   bar = 1.0 E+05 Pa (exact); kilopascal = 1.0 E+03 Pa (SI prefix);
 *   pound-force per square inch (psi) = 6.894 757 E+03 Pa;
 *   inch of water (39.2 °F) = 2.490 82 E+02 Pa;
 *   degree Fahrenheit: t/°C = (t/°F − 32) / 1.8 (SP 811 §B.9 and §4.2.1.1).
 * Pure: no I/O; runs in the browser too.
 */

export type Quantity = 'pressure' | 'temperature';

/** Pressure units and their size in pascals (NIST SP 811 App. B). */
const PASCALS: Record<string, number> = {
  Pa: 1,
  kPa: 1e3,
  bar: 1e5,
  psi: 6.894757e3,
  inH2O: 2.49082e2,
};
const TEMPERATURES = ['°C', '°F'] as const;

/** Spellings people and exports use for the same unit. */
const ALIASES: Record<string, string> = {
  pa: 'Pa',
  kpa: 'kPa',
  bar: 'bar',
  psi: 'psi',
  'lbf/in2': 'psi',
  'lbf/in²': 'psi',
  inh2o: 'inH2O',
  'in h2o': 'inH2O',
  'inh₂o': 'inH2O',
  'in h₂o': 'inH2O',
  'in wc': 'inH2O',
  inwc: 'inH2O',
  '°c': '°C',
  degc: '°C',
  '°f': '°F',
  degf: '°F',
};

/** The units a reading can be converted between. */
export const CONVERTIBLE_UNITS: readonly string[] = Object.freeze([...Object.keys(PASCALS), ...TEMPERATURES]);

/** The unit's own spelling (case and "in H2O"-style variants accepted), or null for a unit not known here. */
export function canonicalUnit(unit: string): string | null {
  if (typeof unit !== 'string') return null;
  const u = unit.trim();
  if (PASCALS[u] !== undefined || (TEMPERATURES as readonly string[]).includes(u)) return u;
  return ALIASES[u.toLowerCase()] ?? null;
}

export function quantityOf(unit: string): Quantity | null {
  const u = canonicalUnit(unit);
  if (u === null) return null;
  return PASCALS[u] !== undefined ? 'pressure' : 'temperature';
}

/** Thrown for a unit not known or not convertible to the target; `message` says which. */
export class UnitError extends Error {}

/**
 * `value` in `from` expressed in `to`. The same unit (or the same spelling of a unit not known here,
 * such as "starts") returns the value unchanged. Throws UnitError for an unknown unit or across
 * quantities (a pressure into a temperature).
 */
export function convertUnit(value: number, from: string, to: string): number {
  if (!Number.isFinite(value)) throw new UnitError(`The value must be a finite number (got ${String(value)})`);
  if (from.trim() === to.trim()) return value;
  const f = canonicalUnit(from);
  const t = canonicalUnit(to);
  if (f === null) throw new UnitError(`Unknown unit “${from}”; known: ${CONVERTIBLE_UNITS.join(', ')}`);
  if (t === null) throw new UnitError(`“${from}” cannot be converted to “${to}”`);
  if (f === t) return value;
  const qf = quantityOf(f);
  const qt = quantityOf(t);
  if (qf !== qt) throw new UnitError(`“${from}” is a ${qf} and “${to}” a ${qt}: one cannot be converted to the other`);
  if (qf === 'pressure') return (value * PASCALS[f]) / PASCALS[t];
  const celsius = f === '°C' ? value : (value - 32) / 1.8;
  return t === '°C' ? celsius : celsius * 1.8 + 32;
}
