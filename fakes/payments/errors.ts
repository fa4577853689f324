// Errors in the provider's wire shape. Source: the provider's API reference, "Errors":
// an `error` object with type, code, message, param (and decline_code, doc_url, payment_intent
// for card errors); 400 for bad parameters, 401 for a bad key, 402 when a card fails,
// 404 for a missing object. Error code names from the provider's error-code list (from memory).

export type ErrorType = 'invalid_request_error' | 'card_error' | 'idempotency_error' | 'api_error';

export interface ProviderError {
  type: ErrorType;
  message: string;
  code?: string;
  param?: string;
  decline_code?: string;
  doc_url?: string;
  charge?: string;
  payment_intent?: unknown;
  payment_method?: unknown;
}

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly body: ProviderError,
  ) {
    super(body.message);
  }
}

export function docUrl(code: string): string {
  return `https://docs.stripe.com/error-codes/${code.replace(/_/g, '-')}`;
}

function invalid(status: number, message: string, code?: string, param?: string): ApiError {
  const body: ProviderError = { type: 'invalid_request_error', message };
  if (code) {
    body.code = code;
    body.doc_url = docUrl(code);
  }
  if (param) body.param = param;
  return new ApiError(status, body);
}

export const missingParam = (param: string) =>
  invalid(400, `Missing required param: ${param}.`, 'parameter_missing', param);

export const unknownParam = (param: string) =>
  invalid(400, `Received unknown parameter: ${param}`, 'parameter_unknown', param);

export const invalidParam = (param: string, message: string, code = 'parameter_invalid_string') =>
  invalid(400, message, code, param);

export const invalidRequest = (message: string, code?: string, param?: string) => invalid(400, message, code, param);

/**
 * A missing object. Retrieving it by URL is a 404 with param "id"; naming it inside a request's
 * parameters (say `customer=cus_x` on a session) is a 400 naming that parameter.
 */
export const noSuch = (kind: string, id: string, param?: string) =>
  invalid(param ? 400 : 404, `No such ${kind}: '${id}'`, 'resource_missing', param ?? 'id');

export const unauthorized = (message: string) => new ApiError(401, { type: 'invalid_request_error', message });
