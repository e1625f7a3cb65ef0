// Errors the API returns: `{ error, fields? }` with the right status, never a stack trace.
import type { ErrorRequestHandler } from 'express';
import type { Logger } from 'pino';
import { ZodError } from 'zod';
import { EngineInputError } from '../../shared/engine/errors';

export class HttpError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly fields?: Record<string, string>,
  ) {
    super(message);
    this.name = 'HttpError';
  }
}

export const badRequest = (message: string, fields?: Record<string, string>) => new HttpError(400, message, fields);
export const unauthorized = (message = 'Sign in first') => new HttpError(401, message);
export const forbidden = (message: string) => new HttpError(403, message);
export const notFound = (message: string) => new HttpError(404, message);
export const conflict = (message: string, fields?: Record<string, string>) => new HttpError(409, message, fields);
export const gone = (message: string) => new HttpError(410, message);

/** `{ "a.b": "message" }` from a zod error, one message per field (the first). */
export function fieldsFromZod(error: ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.length > 0 ? issue.path.join('.') : '_';
    fields[key] ??= issue.message;
  }
  return fields;
}

function describeFields(fields: Record<string, string>): string {
  return Object.entries(fields)
    .map(([field, message]) => (field === '_' ? message : `${field}: ${message}`))
    .join('; ');
}

interface BodyParserError extends Error {
  type?: string;
  status?: number;
  limit?: number;
}

export function errorHandler(logger: Logger): ErrorRequestHandler {
  return (error: unknown, request, response, _next) => {
    if (error instanceof HttpError) {
      response.status(error.status).json({ error: error.message, ...(error.fields ? { fields: error.fields } : {}) });
      return;
    }
    if (error instanceof ZodError) {
      const fields = fieldsFromZod(error);
      response.status(400).json({ error: `Invalid request: ${describeFields(fields)}`, fields });
      return;
    }
    if (error instanceof EngineInputError) {
      const field = error.location.field ?? (error.location.column !== undefined ? String(error.location.column) : '_');
      response.status(400).json({ error: error.message, fields: { [field]: error.message } });
      return;
    }
    const bodyError = error as BodyParserError;
    if (bodyError?.type === 'entity.parse.failed') {
      response.status(400).json({ error: 'The request body is not valid JSON' });
      return;
    }
    if (bodyError?.type === 'entity.too.large') {
      response.status(413).json({ error: `The request body is larger than the ${bodyError.limit} bytes allowed` });
      return;
    }
    logger.error({ err: error, method: request.method, url: request.originalUrl }, 'unhandled error');
    response.status(500).json({ error: 'Internal error; the server log has the details' });
  };
}
