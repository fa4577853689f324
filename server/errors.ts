import { ErrorCode, type ErrorCodeValue } from '../shared/errors.js';

/** Base class of every error a route may throw; the error handler turns it into the error shape. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCodeValue,
    message: string,
    readonly fields?: Record<string, string>,
  ) {
    super(message);
    this.name = new.target.name;
  }
}

export class ValidationError extends AppError {
  constructor(message: string, fields: Record<string, string> = {}) {
    super(400, ErrorCode.validation, message, fields);
  }
}
export class UnauthenticatedError extends AppError {
  constructor(message = 'Sign in to continue.') {
    super(401, ErrorCode.unauthenticated, message);
  }
}
export class ForbiddenError extends AppError {
  constructor(message = 'Your role does not allow this.') {
    super(403, ErrorCode.forbidden, message);
  }
}
export class NotFoundError extends AppError {
  constructor(what = 'Resource') {
    super(404, ErrorCode.notFound, `${what} not found.`);
  }
}
export class ConflictError extends AppError {
  constructor(message: string, fields?: Record<string, string>) {
    super(409, ErrorCode.conflict, message, fields);
  }
}
export class UnavailableError extends AppError {
  constructor(message = 'The database is not reachable; try again shortly.') {
    super(503, ErrorCode.unavailable, message);
  }
}
