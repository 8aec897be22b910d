import type { RequestHandler } from 'express';
import type { z } from 'zod';
import { HttpError } from './errors';

interface Schemas {
  body?: z.ZodType;
  query?: z.ZodType;
  params?: z.ZodType;
}

/**
 * Validates body, query and params against the shared contracts. On failure answers 400 naming
 * each field; on success replaces the parsed parts (so defaults and coercions apply). Express 5
 * makes req.query a getter, so the parsed query is kept on res.locals.query.
 */
export function validate(schemas: Schemas): RequestHandler {
  return (req, res, next) => {
    const fields: Record<string, string[]> = {};
    for (const part of ['params', 'query', 'body'] as const) {
      const schema = schemas[part];
      if (!schema) continue;
      const result = schema.safeParse(req[part] ?? {});
      if (!result.success) {
        for (const issue of result.error.issues) {
          const key = [part, ...issue.path.map(String)].join('.');
          (fields[key] ??= []).push(issue.message);
        }
      } else if (part === 'query') {
        res.locals['query'] = result.data;
      } else {
        req[part] = result.data;
      }
    }
    const names = Object.keys(fields);
    if (names.length > 0) {
      const first = names[0];
      const message = `Invalid ${first}: ${fields[first][0]}${names.length > 1 ? ` (and ${names.length - 1} more)` : ''}`;
      next(new HttpError(400, 'validation_failed', message, fields));
      return;
    }
    next();
  };
}
