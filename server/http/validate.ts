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
        return next(badRequest(`Invalid ${where === 'body' ? 'input' : where}: ${fields.map((f) => `${f.path}: ${f.message}`).join('; ')}`, fields));
      }
      res.locals[where] = result.data;
    }
    next();
  };
}
