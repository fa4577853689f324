/**
 * Error codes shared by server and client. The server answers every error as
 * `{error: {code, message, fields}}`; the client switches on `code`.
 */
export const ErrorCode = {
  validation: 'validation_failed',
  unauthenticated: 'unauthenticated',
  forbidden: 'forbidden',
  notFound: 'not_found',
  conflict: 'conflict',
  tooMany: 'too_many_requests',
  payloadTooLarge: 'payload_too_large',
  unavailable: 'service_unavailable',
  paymentFailed: 'payment_failed',
  internal: 'internal_error',
} as const;
export type ErrorCodeValue = (typeof ErrorCode)[keyof typeof ErrorCode];

export interface ErrorBody {
  error: { code: ErrorCodeValue; message: string; fields?: Record<string, string> };
}

/**
 * Thrown by pure shared code (chemistry, compliance, schemas) when input is not
 * acceptable. `fields` maps an input name (dotted path, e.g. `readings.3.pH`)
 * to the reason. The server turns it into a 400.
 */
export class InputError extends Error {
  readonly fields: Record<string, string>;
  constructor(message: string, fields: Record<string, string> = {}) {
    super(message);
    this.name = 'InputError';
    this.fields = fields;
  }
}

/** Shorthand: one field, one reason. */
export function inputError(field: string, reason: string): InputError {
  return new InputError(`${field}: ${reason}`, { [field]: reason });
}
