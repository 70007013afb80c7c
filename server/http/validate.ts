import type { RequestHandler } from 'express';
import type { z } from 'zod';
import { badRequest } from './errors';
import { ANY_TEXT_MESSAGE, findUnstorableText } from '../../shared/schemas/text';

type Schemas = { body?: z.ZodType; query?: z.ZodType; params?: z.ZodType };

function toFields(error: z.ZodError, where: string) {
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
 * Parses body, query and params with the shared zod schemas. Parsed values land on
 * `res.locals.body/query/params` (Express 5's req.query is a read-only getter). No string in
 * them may hold NUL or an unpaired surrogate (shared/schemas/text.ts), whatever the schema.
 */
export function validate(schemas: Schemas): RequestHandler {
  return (req, res, next) => {
    for (const where of ['params', 'query', 'body'] as const) {
      const schema = schemas[where];
      if (!schema) continue;
      const input = where === 'body' ? (req.body ?? {}) : req[where];
      const result = schema.safeParse(input);
      if (!result.success) {
        const fields = toFields(result.error, where);
        return next(badRequest(`Please check ${fields.map((f) => `${readablePath(f.path)}: ${f.message}`).join('; ')}`, fields));
      }
      // Every string, whatever its schema says: NUL and broken characters cannot be stored.
      const unstorable = findUnstorableText(result.data);
      if (unstorable) {
        const path = unstorable.path.length ? unstorable.path.join('.') : where;
        return next(badRequest(`Please check ${readablePath(path)}: ${ANY_TEXT_MESSAGE}`, [{ path, message: ANY_TEXT_MESSAGE }]));
      }
      res.locals[where] = result.data;
    }
    next();
  };
}
