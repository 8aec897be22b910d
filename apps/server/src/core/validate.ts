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
      const nulAt = nulPath(req[part], part);
      if (nulAt) {
        (fields[nulAt] ??= []).push('must not contain the NUL character (U+0000)');
        continue;
      }
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

/**
 * The path (as "part.a.0.b") of the first string or key holding U+0000, or null. PostgreSQL
 * refuses NUL in text, so such input is the client's mistake and must not reach a query. Walks
 * with its own stack: a deeply nested JSON body must not overflow the call stack.
 */
export function nulPath(value: unknown, part: string): string | null {
  const stack: Array<[unknown, string]> = [[value, part]];
  while (stack.length > 0) {
    const [v, at] = stack.pop()!;
    if (typeof v === 'string') {
      if (v.includes('\u0000')) return at;
    } else if (v !== null && typeof v === 'object') {
      for (const [key, child] of Object.entries(v)) {
        const path = `${at}.${key.replaceAll('\u0000', '\\0')}`;
        if (key.includes('\u0000')) return path;
        stack.push([child, path]);
      }
    }
  }
  return null;
}

/** 400 for a NUL character anywhere in the path parameters, query or body, naming where. */
export const rejectNulCharacters: RequestHandler = (req, _res, next) => {
  for (const part of ['params', 'query', 'body'] as const) {
    const at = nulPath(req[part], part);
    if (at) {
      const message = 'must not contain the NUL character (U+0000)';
      next(new HttpError(400, 'validation_failed', `Invalid ${at}: ${message}`, { [at]: [message] }));
      return;
    }
  }
  next();
};
