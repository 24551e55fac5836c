import type { ErrorRequestHandler, RequestHandler } from 'express';
import { MulterError } from 'multer';
import { ZodError } from 'zod';
import { HttpError } from '../http-error.js';
import { StatsInputError } from '../stats/errors.js';
import type { ApiErrorBody } from '../../shared/errors.js';

export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(new HttpError(404, `No API route ${req.method} ${req.path}`));
};

/** Bad-input errors from the numeric engines carry their message to the client as a 400. */
function isInputError(err: unknown): err is Error {
  return err instanceof StatsInputError || (err instanceof Error && err.name === 'CalcInputError');
}

/**
 * One place maps errors to responses: zod -> 400 with field details, HttpError -> its status,
 * engine input errors -> 400, body-parser/multer limits -> 413/400, everything else -> 500 with no
 * internals (the stack goes to the log only).
 */
export const errorHandler: ErrorRequestHandler = (err: unknown, req, res, _next) => {
  let status = 500;
  let body: ApiErrorBody = { message: 'Something went wrong on the server. The problem was logged.' };
  if (err instanceof ZodError) {
    status = 400;
    body = {
      message: 'Some fields are not valid: ' + err.issues.map((i) => `${i.path.join('.') || 'body'}: ${i.message}`).join('; '),
      details: err.issues.map((i) => ({ path: i.path.join('.'), message: i.message })),
    };
  } else if (err instanceof HttpError) {
    status = err.status;
    body = { message: err.message, details: err.extra?.details, current: err.extra?.current };
    if (err.extra?.retryAfterSeconds) res.setHeader('Retry-After', String(err.extra.retryAfterSeconds));
  } else if (isInputError(err)) {
    status = 400;
    body = { message: err.message };
  } else if (err instanceof MulterError) {
    status = err.code === 'LIMIT_FILE_SIZE' ? 413 : 400;
    body = { message: err.code === 'LIMIT_FILE_SIZE' ? 'The file is larger than the upload limit' : `Upload refused: ${err.message}` };
  } else if (isBodyParserError(err)) {
    status = err.status;
    body = {
      message:
        err.type === 'entity.too.large'
          ? 'The request body is larger than the limit'
          : err.type === 'entity.parse.failed'
            ? 'The request body is not valid JSON'
            : `The request body could not be read (${err.type})`,
    };
  }
  if (status >= 500) req.log?.error({ err }, 'unhandled error');
  if (res.headersSent) return;
  res.status(status).json(body);
};

function isBodyParserError(err: unknown): err is { status: number; type: string } {
  return typeof err === 'object' && err !== null && 'type' in err && 'status' in err && typeof (err as { status: unknown }).status === 'number';
}
