import { z } from "zod";

export type IssueLike = { path: string; message: string };

const STATUS_BY_CODE = {
  bad_request: 400,
  invalid_input: 400,
  invalid_json: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  payload_too_large: 413,
  unsupported_media_type: 415,
  rate_limited: 429,
  internal: 500,
  unavailable: 503,
} as const;

export type ErrorCode = keyof typeof STATUS_BY_CODE;

/** The one error type the API speaks; it maps to a status and a JSON body. */
export class AppError extends Error {
  readonly code: ErrorCode;
  readonly issues?: IssueLike[];
  readonly headers?: Record<string, string>;

  constructor(
    code: ErrorCode,
    message: string,
    options: { issues?: IssueLike[]; headers?: Record<string, string> } = {},
  ) {
    super(message);
    this.name = "AppError";
    this.code = code;
    this.issues = options.issues;
    this.headers = options.headers;
  }

  get status(): number {
    return STATUS_BY_CODE[this.code];
  }

  toBody(): ErrorBody {
    return {
      error: { code: this.code, message: this.message, ...(this.issues ? { issues: this.issues } : {}) },
    };
  }
}

export type ErrorBody = { error: { code: ErrorCode; message: string; issues?: IssueLike[] } };

export function issuesFromZod(error: z.ZodError): IssueLike[] {
  return error.issues.map((issue) => ({
    path: issue.path.map(String).join("."),
    message: issue.message,
  }));
}

export function invalidInput(error: z.ZodError, message = "Some fields need attention."): AppError {
  return new AppError("invalid_input", message, { issues: issuesFromZod(error) });
}
