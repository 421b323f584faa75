import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';

export interface FieldError {
  path: string;
  message: string;
}

/** The one application error: a readable message, an HTTP status and optional per-field messages. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly fields?: FieldError[],
    /** Extra top-level keys of the error body, e.g. `conflict` on a 409. */
    readonly extra?: Record<string, unknown>,
  ) {
    super(message);
    this.name = 'AppError';
  }
}

export const badRequest = (message: string, fields?: FieldError[]) => new AppError(400, message, fields);
export const notFound = (what = 'Not found') => new AppError(404, what);
export const forbidden = (message = 'You do not have permission to do this') => new AppError(403, message);

export function fieldErrorsFromZod(err: ZodError): FieldError[] {
  return err.issues.map((i) => ({ path: i.path.join('.') || '(body)', message: i.message }));
}

export function errorBody(message: string, fields?: FieldError[]) {
  return { error: fields?.length ? { message, fields } : { message } };
}

export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(new AppError(404, `No API route for ${req.method} ${req.originalUrl.split('?')[0]}`));
};

/** Turns every error into the JSON error shape; never sends a stack trace to a client. */
export const errorMiddleware: ErrorRequestHandler = (err, req, res, _next) => {
  if (err instanceof ZodError) {
    res.status(400).json(errorBody('Some fields are not valid', fieldErrorsFromZod(err)));
    return;
  }
  if (err instanceof AppError) {
    res.status(err.status).json({ ...errorBody(err.message, err.fields), ...err.extra });
    return;
  }
  const status = typeof err?.status === 'number' ? err.status : 500;
  if (err?.type === 'entity.too.large') {
    res
      .status(413)
      .json(errorBody(`The request body is larger than the limit of ${err.limit} bytes for ${req.path}; send it in smaller parts.`));
    return;
  }
  if (err?.type === 'entity.parse.failed') {
    res.status(400).json(errorBody('The request body is not valid JSON'));
    return;
  }
  if (status >= 400 && status < 500) {
    res.status(status).json(errorBody(err.message || 'Bad request'));
    return;
  }
  console.error(`[error] ${req.method} ${req.originalUrl}:`, err);
  res.status(500).json(errorBody('Something went wrong on the server; the request was not completed.'));
};
