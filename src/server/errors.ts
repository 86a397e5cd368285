/** Error codes of the one error envelope, with their HTTP statuses. */
export const ERROR_STATUS = {
  invalid_plan: 400,
  invalid_request: 400,
  invalid_json: 400,
  unsupported_media_type: 415,
  unauthorized: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  payload_too_large: 413,
  rate_limited: 429,
  internal: 500,
} as const;

export type ErrorCode = keyof typeof ERROR_STATUS;

export interface Issue {
  path: string;
  message: string;
}

export interface ErrorEnvelope {
  error: { code: ErrorCode; message: string };
  issues: Issue[];
  [extra: string]: unknown;
}

/** Thrown inside a route to answer with the error envelope. */
export class HttpError extends Error {
  constructor(
    public code: ErrorCode,
    message: string,
    public issues: Issue[] = [],
    public extra: Record<string, unknown> = {},
    public headers: Record<string, string> = {},
  ) {
    super(message);
  }
}
