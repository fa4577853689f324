import type { ErrorRequestHandler, RequestHandler } from 'express';
import { BaseError, ConnectionError, TimeoutError } from 'sequelize';
import type { Logger } from 'pino';
import { ErrorCode, InputError, type ErrorBody } from '../../shared/errors.js';
import { AppError } from '../errors.js';
import { isRetryableLockError } from '../services/transaction.js';

/** 404 in the error shape for any /api path no router answered. */
export const apiNotFound: RequestHandler = (req, res) => {
  const body: ErrorBody = { error: { code: ErrorCode.notFound, message: `No route for ${req.method} ${req.originalUrl.split("?")[0]}.` } };
  res.status(404).json(body);
};

/**
 * The connector's and the socket's codes for a database that is gone or going: refused, reset,
 * closed under a command, shutting down, the connection killed or timed out.
 */
const DB_DOWN = /^(ECONNREFUSED|ECONNRESET|EPIPE|ETIMEDOUT|PROTOCOL_CONNECTION_LOST|ER_GET_CONNECTION_TIMEOUT|ER_CONNECTION_TIMEOUT|ER_SOCKET_UNEXPECTED_CLOSE|ER_SOCKET_TIMEOUT|ER_CLIENT_CLOSED_CONNECTION|ER_CMD_CONNECTION_CLOSED|ER_CONNECTION_ALREADY_CLOSED|ER_CMD_NOT_EXECUTED_DESTROYED|ER_SERVER_SHUTDOWN|ER_CONNECTION_KILLED)$/;

/**
 * A lost database, whether the error came through Sequelize (wrapped, the connector's error as
 * `parent`) or straight from the connector (the batch insert runs on the transaction's own
 * connection, so its errors are not wrapped). Only the connector's own errors count: a reset
 * socket to the mail or payment service is not the database.
 */
function isDbDown(err: unknown): boolean {
  if (err instanceof ConnectionError || err instanceof TimeoutError) return true;
  const raw = (err instanceof BaseError ? (err as { parent?: unknown }).parent : err) as { name?: unknown; code?: unknown } | null | undefined;
  return raw?.name === 'SqlError' && typeof raw.code === 'string' && DB_DOWN.test(raw.code);
}

/**
 * The one error handler: AppErrors and shared InputErrors keep their status and fields,
 * body-parser errors become 400/413, a lost database is 503, anything else is logged and
 * masked as 500 with no internals.
 */
export function errorHandler(log: Logger): ErrorRequestHandler {
  return (err, req, res, _next) => {
    let status = 500;
    let body: ErrorBody;
    if (err instanceof AppError) {
      status = err.status;
      body = { error: { code: err.code, message: err.message, ...(err.fields ? { fields: err.fields } : {}) } };
    } else if (err instanceof InputError) {
      status = 400;
      body = { error: { code: ErrorCode.validation, message: err.message, fields: err.fields } };
    } else if (err?.type === 'entity.parse.failed') {
      status = 400;
      body = { error: { code: ErrorCode.validation, message: 'The request body is not valid JSON.', fields: { body: 'invalid JSON' } } };
    } else if (err?.type === 'entity.too.large' || err?.code === 'LIMIT_FILE_SIZE') {
      status = 413;
      body = { error: { code: ErrorCode.payloadTooLarge, message: 'The request is larger than the limit.', fields: { body: 'too large' } } };
    } else if (typeof err?.status === 'number' && err.status >= 400 && err.status < 500 && err.expose) {
      status = err.status;
      const code = status === 404 ? ErrorCode.notFound : status === 413 ? ErrorCode.payloadTooLarge : ErrorCode.validation;
      body = { error: { code, message: String(err.message) } };
    } else if (isRetryableLockError(err)) {
      // still locked out after the retries: nothing was saved, and the client may try again
      status = 503;
      body = { error: { code: ErrorCode.unavailable, message: 'The record is busy with another change; nothing was saved. Try again.' } };
      log.warn({ err: { message: err?.message }, path: req.path }, 'lock conflict after retries');
    } else if (isDbDown(err)) {
      status = 503;
      body = { error: { code: ErrorCode.unavailable, message: 'The database is not reachable; try again shortly.' } };
      log.warn({ err: { message: err?.message }, path: req.path }, 'database unavailable');
    } else {
      log.error({ err, method: req.method, path: req.path }, 'unexpected error');
      body = { error: { code: ErrorCode.internal, message: 'Something went wrong on our side. It has been logged.' } };
    }
    if (res.headersSent) return;
    res.status(status).json(body);
  };
}
