/**
 * One import point for the `rrule` package (2.8.1).
 *
 * Why this file exists: rrule 2.8.1 ships a CommonJS build (`main`) and an ES
 * build (`module`) without an `exports` map or `"type": "module"`. Node ESM
 * (tsx, vitest's externalised deps) loads the CommonJS build, where the named
 * exports sit on `default`; Vite's bundler picks the ES build, where they are
 * real named exports. No single `import { RRule } from 'rrule'` works in both,
 * so we take the namespace and use `default` when it is there.
 *
 * Everything else in shared/domain imports rrule from here, never directly.
 */
import * as rruleNs from 'rrule';
import type * as RRuleTypes from 'rrule';

type RRuleModule = typeof RRuleTypes;

// The namespace object is either the module itself (ES build) or a CommonJS
// wrapper with the module on `default` (Node ESM interop). Reflect.get keeps
// bundlers from warning that the ES build has no `default` export.
const mod: RRuleModule = (Reflect.get(rruleNs, 'default') as RRuleModule | undefined) ?? (rruleNs as unknown as RRuleModule);

if (typeof mod.RRule !== 'function') {
  // Fail loudly at import time rather than with "RRule is not a constructor" later.
  throw new Error('rrule: could not find the RRule export in the installed package');
}

/** rrule's RRule class (RFC 5545 §3.3.10 RECUR value expander). */
export const RRule = mod.RRule;
export type RRule = RRuleTypes.RRule;

/** rrule's RRuleSet class (RFC 5545 §3.8.5: RRULE + RDATE − EXDATE). */
export const RRuleSet = mod.RRuleSet;
export type RRuleSet = RRuleTypes.RRuleSet;

/** rrule's parser for RFC 5545 RRULE/DTSTART text (lenient; see recurrence/parse.ts for strict parsing). */
export const rrulestr = mod.rrulestr;

/** FREQ values of RFC 5545 §3.3.10, as rrule numbers them (YEARLY = 0 … SECONDLY = 6). */
export const Frequency = mod.Frequency;
export type Frequency = RRuleTypes.Frequency;

/** rrule's weekday value (RFC 5545 §3.3.10 `weekdaynum`: weekday plus optional ordinal). */
export const Weekday = mod.Weekday;
export type Weekday = RRuleTypes.Weekday;

export type Options = RRuleTypes.Options;
