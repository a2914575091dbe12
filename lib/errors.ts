// The one error shape of Cloche: a code that maps to an HTTP status, a message fit to
// show the person, and for bad input the fields at fault.
import { isDatabaseUnreachable } from "./database-errors";
export const ERROR_STATUS = {
  bad_input: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  too_large: 413,
  rate_limited: 429,
  internal: 500,
  unavailable: 503,
} as const;

export type ErrorCode = keyof typeof ERROR_STATUS;

/** Field path → what is wrong with it. */
export type FieldErrors = Record<string, string>;

export class AppError extends Error {
  readonly code: ErrorCode;
  readonly fields?: FieldErrors;

  constructor(code: ErrorCode, message: string, fields?: FieldErrors) {
    super(message);
    this.name = "AppError";
    this.code = code;
    this.fields = fields;
  }

  get status(): number {
    return ERROR_STATUS[this.code];
  }
}

export type ErrorBody = { error: { code: ErrorCode; message: string; fields?: FieldErrors } };

export function errorBody(error: AppError): ErrorBody {
  return { error: { code: error.code, message: error.message, ...(error.fields ? { fields: error.fields } : {}) } };
}

/** What a person is told when the database does not answer; the controller does not need it to keep control. */
export const DATABASE_UNAVAILABLE_MESSAGE =
  "Cloche cannot reach its database just now, so this cannot be shown or saved. Control of the houses carries on without it. Try again in a minute.";

/** Any thrown value as an AppError; the detail of unexpected ones is logged, never shown. */
export function toAppError(error: unknown): AppError {
  if (error instanceof AppError) return error;
  if (isDatabaseUnreachable(error)) {
    console.error("[cloche] database unavailable:", error instanceof Error ? error.message : error);
    return new AppError("unavailable", DATABASE_UNAVAILABLE_MESSAGE);
  }
  console.error("[cloche] unexpected error", error);
  return new AppError("internal", "Something went wrong on our side. Please try again.");
}
