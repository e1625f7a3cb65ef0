import type { RequestHandler } from 'express';
import type { z } from 'zod';
import { badRequest, fieldsFromZod } from './errors';

/** Replaces `request.body` with its parsed form, or answers 400 naming each bad field. */
export function validateBody(schema: z.ZodType): RequestHandler {
  return (request, _response, next) => {
    const result = schema.safeParse(request.body ?? {});
    if (!result.success) {
      const fields = fieldsFromZod(result.error);
      const summary = Object.entries(fields)
        .map(([field, message]) => `${field}: ${message}`)
        .join('; ');
      next(badRequest(`Invalid request: ${summary}`, fields));
      return;
    }
    request.body = result.data;
    next();
  };
}
