import { z } from 'zod';

/**
 * Text rules shared by every schema. PostgreSQL cannot store NUL in text (the write would fail
 * with a server error), an unpaired UTF-16 surrogate is not a character at all (it would be
 * stored as U+FFFD, so a signed statement would no longer read as signed), and a control
 * character in a name or title breaks mail headers, CSV lines, PDFs and labels.
 */
// eslint-disable-next-line no-control-regex -- finding NUL is the point of this pattern
const ANY_TEXT_FORBIDDEN = /[\u0000\p{Cs}]/u;
/** Controls of every kind (C0 with tab, CR and LF; DEL; C1) and unpaired surrogates. */
const ONE_LINE_FORBIDDEN = /[\p{Cc}\p{Cs}]/u;
/**
 * Unicode's explicit direction embeddings, overrides and isolates (Unicode Standard Annex #9,
 * "Unicode Bidirectional Algorithm", table 1: LRE, RLE, PDF, LRO, RLO and LRI, RLI, FSI, PDI).
 * Invisible, they make a name or title display in an order other than the one stored, so a
 * list, label or signed statement could read differently from what was saved.
 */
const DIRECTION_CONTROLS = /[\u202A-\u202E\u2066-\u2069]/u;

export const ANY_TEXT_MESSAGE = 'Contains a NUL or a broken (unpaired surrogate) character';
export const ONE_LINE_MESSAGE = 'Use one line of plain text: no line breaks, tabs or control characters';
export const DIRECTION_CONTROL_MESSAGE =
  'Contains a hidden text-direction character (U+202A–U+202E or U+2066–U+2069) that would change how the text displays; type it again without it';

/** True when a multi-line text may be stored: line breaks and tabs are fine, NUL and broken characters are not. */
export const isStorableText = (v: string) => !ANY_TEXT_FORBIDDEN.test(v);
export const hasNoDirectionControls = (v: string) => !DIRECTION_CONTROLS.test(v);
export const isOneLineText = (v: string) => !ONE_LINE_FORBIDDEN.test(v) && hasNoDirectionControls(v);

/** Names, titles, codes, labels: one line, no control characters, no hidden direction changes. Wraps a string schema. */
export function oneLine<T extends z.ZodString>(schema: T): T {
  return schema.refine((v) => !ONE_LINE_FORBIDDEN.test(v), ONE_LINE_MESSAGE).refine(hasNoDirectionControls, DIRECTION_CONTROL_MESSAGE);
}

/**
 * Dates people and machines enter lie between these years; outside them a date is a typo or an
 * attack, and some (year 0) cannot be stored at all.
 */
export const FIRST_YEAR = 1900;
export const LAST_YEAR = 2200;
const YEARS_MESSAGE = `Use a year between ${FIRST_YEAR} and ${LAST_YEAR}`;
const saneYear = (v: string) => {
  const year = Number(v.slice(0, 4));
  return year >= FIRST_YEAR && year <= LAST_YEAR;
};
const notBeforeFirstYear = (v: string) => Number(v.slice(0, 4)) >= FIRST_YEAR;

/** An ISO 8601 date-time with offset (2026-03-14T07:30:00Z) in a sane year. */
export const isoDateTime = (message: string) => z.iso.datetime({ offset: true, message }).refine(saneYear, YEARS_MESSAGE);
/**
 * An ISO 8601 calendar date (2026-03-14) in a sane year. With `refusedIfFuture` the server refuses
 * any date after today with its own message, so only the lower bound is checked here.
 */
export const isoDate = (message: string, opts: { refusedIfFuture?: boolean } = {}) =>
  opts.refusedIfFuture
    ? z.iso.date({ message }).refine(notBeforeFirstYear, `Use a year from ${FIRST_YEAR} on`)
    : z.iso.date({ message }).refine(saneYear, YEARS_MESSAGE);
/** A local wall-clock date-time such as 2026-03-14T07:30 in a sane year. */
export const localDateTime = (message: string) =>
  z
    .string()
    .trim()
    .regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2})?$/, message)
    .refine(saneYear, YEARS_MESSAGE);

type Found = { path: (string | number)[] };
/** The first string anywhere in a parsed value that may not be stored, with its path. */
export function findUnstorableText(value: unknown, path: (string | number)[] = []): Found | null {
  if (typeof value === 'string') return isStorableText(value) ? null : { path };
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const hit = findUnstorableText(value[i], [...path, i]);
      if (hit) return hit;
    }
  } else if (value && typeof value === 'object' && Object.getPrototypeOf(value) === Object.prototype) {
    for (const [k, v] of Object.entries(value)) {
      const hit = findUnstorableText(v, [...path, k]);
      if (hit) return hit;
    }
  }
  return null;
}
