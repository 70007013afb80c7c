import type { RequestHandler } from 'express';
import type { z } from 'zod';
import { badRequest } from './errors';

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
 * `res.locals.body/query/params` (Express 5's req.query is a read-only getter).
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
      res.locals[where] = result.data;
    }
    next();
  };
}
