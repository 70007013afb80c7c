/**
 * Filter-lens shade numbers for plasma arc cutting (PAC).
 *
 * Pure module: no I/O, runs on the server and in the browser.
 *
 * Default table: OSHA 29 CFR 1910.133(a)(5), "Filter Lenses for Protection
 * Against Radiant Energy", plasma arc cutting rows (minimum protective shade),
 * with the suggested (comfort) shade column from ANSI Z49.1-2005 (also
 * printed in AWS F2.2), which uses the same three current bands.
 */

/** One current band of a shade table. */
export interface ShadeBand {
  /** Short name shown to users, e.g. "light". */
  readonly label: string;
  /** Lowest arc current of the band, amperes (inclusive). */
  readonly fromA: number;
  /**
   * Upper edge, amperes. Exclusive for every band but the last: a current
   * equal to this edge belongs to the next, darker band. The last band
   * includes its upper edge; anything above it is outside the table.
   */
  readonly toA: number;
  /** Minimum protective shade number. */
  readonly minimum: number;
  /** Suggested (comfort) shade number; never lighter than `minimum`. */
  readonly suggested: number;
}

/** A complete shade table, with the citation the UI shows next to it. */
export interface ShadeTable {
  /** Citation of the published table the bands come from. */
  readonly source: string;
  /** Footnotes of the published table that change how a result is used. */
  readonly notes: readonly string[];
  /** Bands in ascending current order, contiguous, no gaps or overlaps. */
  readonly bands: readonly ShadeBand[];
}

/** Result of a shade look-up. */
export interface PlasmaCuttingShade {
  minimum: number;
  suggested: number;
  /** Label of the band the current fell in. */
  band: string;
  /** Source string of the table used (default or site override). */
  source: string;
}

function deepFreeze<T>(value: T): T {
  if (value !== null && typeof value === 'object') {
    for (const inner of Object.values(value)) deepFreeze(inner);
    Object.freeze(value);
  }
  return value;
}

/**
 * Plasma arc cutting shades: OSHA 29 CFR 1910.133(a)(5) table (minimum
 * column: light < 300 A → 8, medium 300–400 A → 9, heavy 400–800 A → 10) and
 * ANSI Z49.1-2005 / AWS F2.2 suggested column (9, 12, 14).
 *
 * Boundaries, because the published rows read "less than 300", "300-400" and
 * "400-800":
 * - 300 A is medium: light is strictly "less than 300".
 * - 400 A is heavy: it is printed in both the medium and the heavy row, and
 *   the darker row satisfies both readings, so the darker one wins.
 * - 800 A is heavy (top of the table); above 800 A the table says nothing.
 *
 * ANSI Z49.1:2012 and AWS F2.2:2001 split the range below 300 A into finer
 * bands with lighter minimums (down to shade 4 below 20 A). The OSHA row
 * (minimum 8 for everything below 300 A) is kept as the default because it is
 * the regulatory text; a site that follows the finer table can pass it as an
 * override.
 */
export const PLASMA_ARC_CUTTING_SHADES: ShadeTable = deepFreeze({
  source:
    'OSHA 29 CFR 1910.133(a)(5), table "Filter Lenses for Protection Against Radiant Energy", ' +
    'plasma arc cutting (minimum shade); suggested shade from ANSI Z49.1-2005 / AWS F2.2',
  notes: [
    // Footnote * of the OSHA table (same wording as the ANSI/AWS footnote).
    'As a rule of thumb, start with a shade that is too dark to see the weld zone, then go to a ' +
      'lighter shade which gives sufficient view of the weld zone without going below the minimum.',
    // Footnote ** of the OSHA table, attached to the plasma arc cutting rows.
    'These values apply where the actual arc is clearly seen; lighter filters may be used when ' + 'the arc is hidden by the workpiece.',
  ],
  bands: [
    { label: 'light', fromA: 0, toA: 300, minimum: 8, suggested: 9 },
    { label: 'medium', fromA: 300, toA: 400, minimum: 9, suggested: 12 },
    { label: 'heavy', fromA: 400, toA: 800, minimum: 10, suggested: 14 },
  ],
});

function isFiniteNumber(value: unknown): value is number {
  return typeof value === 'number' && Number.isFinite(value);
}

/**
 * Checks a shade table's shape so a bad site override fails loudly instead of
 * silently returning a wrong shade. Throws an Error naming the problem.
 */
export function validateShadeTable(table: ShadeTable): void {
  if (table === null || typeof table !== 'object') {
    throw new Error('shade table must be an object with source, notes and bands');
  }
  if (typeof table.source !== 'string' || table.source.trim() === '') {
    throw new Error('shade table must name its source (non-empty string)');
  }
  if (!Array.isArray(table.notes) || table.notes.some((n) => typeof n !== 'string')) {
    throw new Error('shade table notes must be an array of strings');
  }
  if (!Array.isArray(table.bands) || table.bands.length === 0) {
    throw new Error('shade table must have at least one band');
  }
  table.bands.forEach((band: ShadeBand, i: number) => {
    const where = `shade table band ${i}`;
    if (band === null || typeof band !== 'object') throw new Error(`${where} must be an object`);
    if (typeof band.label !== 'string' || band.label.trim() === '') {
      throw new Error(`${where} must have a non-empty label`);
    }
    for (const key of ['fromA', 'toA', 'minimum', 'suggested'] as const) {
      if (!isFiniteNumber(band[key])) {
        throw new Error(`${where} (${band.label}): ${key} must be a finite number (got ${String(band[key])})`);
      }
    }
    if (band.fromA < 0) throw new Error(`${where} (${band.label}): fromA must be >= 0 A`);
    if (band.toA <= band.fromA) {
      throw new Error(`${where} (${band.label}): toA (${band.toA} A) must be greater than fromA (${band.fromA} A)`);
    }
    if (band.minimum <= 0) throw new Error(`${where} (${band.label}): minimum shade must be > 0`);
    // The footnote says never go below the minimum, so a suggestion lighter
    // than the minimum is a contradiction in the table itself.
    if (band.suggested < band.minimum) {
      throw new Error(`${where} (${band.label}): suggested shade ${band.suggested} is lighter than minimum ${band.minimum}`);
    }
    if (i > 0) {
      const prev = table.bands[i - 1];
      if (band.fromA !== prev.toA) {
        const kind = band.fromA > prev.toA ? 'gap' : 'overlap';
        throw new Error(
          `shade table has a ${kind} between band ${i - 1} (${prev.label}, ends ${prev.toA} A) ` +
            `and band ${i} (${band.label}, starts ${band.fromA} A); bands must be contiguous and ascending`,
        );
      }
    }
  });
}

/**
 * Minimum and suggested filter-lens shade for plasma arc cutting at a given
 * arc current.
 *
 * Source: OSHA 29 CFR 1910.133(a)(5) table (minimum) and ANSI Z49.1-2005 /
 * AWS F2.2 (suggested), unless `table` overrides it for a site that follows a
 * different local code. Band edges: a current equal to a band's upper edge
 * belongs to the next, darker band (300 A → medium, 400 A → heavy); the top
 * edge of the last band (800 A) is inside the table.
 *
 * Throws for a non-finite or non-positive current, a current below the first
 * band, a current above the table's top, or a malformed override table.
 */
export function plasmaCuttingShade(arcCurrentA: number, table: ShadeTable = PLASMA_ARC_CUTTING_SHADES): PlasmaCuttingShade {
  if (typeof arcCurrentA !== 'number' || Number.isNaN(arcCurrentA)) {
    throw new Error(`arc current must be a number of amperes (got ${String(arcCurrentA)})`);
  }
  if (!Number.isFinite(arcCurrentA)) {
    throw new Error(`arc current must be finite (got ${arcCurrentA})`);
  }
  if (arcCurrentA <= 0) {
    throw new Error(`arc current must be greater than 0 A (got ${arcCurrentA} A)`);
  }
  if (table !== PLASMA_ARC_CUTTING_SHADES) validateShadeTable(table);

  const { bands } = table;
  const first = bands[0];
  const last = bands[bands.length - 1];
  if (arcCurrentA < first.fromA) {
    throw new Error(`arc current ${arcCurrentA} A is below the table (starts at ${first.fromA} A; ${table.source})`);
  }
  if (arcCurrentA > last.toA) {
    throw new Error(
      `arc current ${arcCurrentA} A is above the table (ends at ${last.toA} A; ${table.source}); ` + 'no published shade applies, ask the lens or torch maker',
    );
  }
  const isLast = (i: number) => i === bands.length - 1;
  const index = bands.findIndex((b, i) => arcCurrentA >= b.fromA && (isLast(i) ? arcCurrentA <= b.toA : arcCurrentA < b.toA));
  // Unreachable for a validated (contiguous) table; kept as a guard.
  if (index < 0) throw new Error(`no band covers ${arcCurrentA} A in ${table.source}`);
  const band = bands[index];
  return { minimum: band.minimum, suggested: band.suggested, band: band.label, source: table.source };
}
