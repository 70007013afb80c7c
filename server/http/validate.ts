import type { Request } from 'express';
import type { z } from 'zod';
import { validationFailed } from './errors';
import type { FieldErrors } from '../../shared/schemas/common';
import { ANY_TEXT_MESSAGE, findUnstorableText } from '../../shared/schemas/text';

export type Schemas = { body?: z.ZodType; query?: z.ZodType; params?: z.ZodType };

/** What a schema parses to, or `undefined` where the route declares none. */
type Parsed<T> = T extends z.ZodType ? z.output<T> : undefined;
export type ParsedInput<S extends Schemas> = {
  body: Parsed<S['body']>;
  query: Parsed<S['query']>;
  params: Parsed<S['params']>;
};

function toFields(error: z.ZodError, where: string): FieldErrors {
  return error.issues.map((i) => ({
    path: i.path.length ? i.path.join('.') : where,
    message: i.message,
  }));
}

/** "triggers.0.every" → "triggers 1 › every": the summary is read by people; `fields` keep the exact paths for forms. */
function readablePath(path: string): string {
  return path
    .split('.')
    .map((part) => (/^\d+$/.test(part) ? String(Number(part) + 1) : part))
    .join(' › ')
    .replace(/ › (\d+)/g, ' $1');
}

/**
 * Parses params, query and body (in that order) with the shared zod schemas and returns the
 * parsed values, or throws a 400 naming every problem of the first part that fails.
 */
export function parseInput<S extends Schemas>(schemas: S, req: Request): ParsedInput<S> {
  const out: Record<'body' | 'query' | 'params', unknown> = { body: undefined, query: undefined, params: undefined };
  for (const where of ['params', 'query', 'body'] as const) {
    const schema = schemas[where];
    if (!schema) continue;
    const input = where === 'body' ? (req.body ?? {}) : req[where];
    const result = schema.safeParse(input);
    if (!result.success) {
      const fields = toFields(result.error, where);
      throw validationFailed(`Please check ${fields.map((f) => `${readablePath(f.path)}: ${f.message}`).join('; ')}`, fields);
    }
    // Every string, whatever its schema says: NUL and broken characters cannot be stored.
    const unstorable = findUnstorableText(result.data);
    if (unstorable) {
      const path = unstorable.path.length ? unstorable.path.join('.') : where;
      throw validationFailed(`Please check ${readablePath(path)}: ${ANY_TEXT_MESSAGE}`, [{ path, message: ANY_TEXT_MESSAGE }]);
    }
    out[where] = result.data;
  }
  // Each part was parsed by its own schema just above; TypeScript cannot follow the loop.
  return out as ParsedInput<S>;
}
