import { z } from "zod";
import { AppError, errorBody, toAppError, type FieldErrors } from "@/lib/errors";

const MAX_BODY_BYTES = 64 * 1024;

export function fieldErrors(error: z.core.$ZodError): FieldErrors {
  const fields: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join(".") : "body";
    fields[key] ??= issue.message;
  }
  return fields;
}

export function firstIssue(error: z.core.$ZodError) {
  const issue = error.issues[0];
  const field = issue?.path.length ? issue.path.join(".") : "body";
  return { field, message: issue ? `${field}: ${issue.message}` : "The input is not valid" };
}

export function badInput(error: z.core.$ZodError): AppError {
  return new AppError("bad_input", firstIssue(error).message, fieldErrors(error));
}

/** Any zod schema, of the full build or the small one ("zod/mini"). */
export type AnySchema = z.core.$ZodType;

export function parseWith<S extends AnySchema>(schema: S, value: unknown): z.infer<S> {
  const parsed = z.safeParse(schema, value);
  if (!parsed.success) throw badInput(parsed.error);
  return parsed.data;
}

/** Reads a JSON body: too large → 413, not JSON → 400, wrong shape → 400 naming the field. */
export async function parseJsonBody<S extends AnySchema>(request: Request, schema: S): Promise<z.infer<S>> {
  const declared = Number(request.headers.get("content-length") ?? "0");
  if (declared > MAX_BODY_BYTES) throw new AppError("too_large", `The body must be at most ${MAX_BODY_BYTES} bytes`);
  const text = await request.text();
  if (Buffer.byteLength(text) > MAX_BODY_BYTES) {
    throw new AppError("too_large", `The body must be at most ${MAX_BODY_BYTES} bytes`);
  }
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch {
    throw new AppError("bad_input", "body: the body must be valid JSON", { body: "must be valid JSON" });
  }
  if (value === null || typeof value !== "object" || Array.isArray(value)) {
    throw new AppError("bad_input", "body: the body must be a JSON object", { body: "must be a JSON object" });
  }
  return parseWith(schema, value);
}

export function errorResponse(error: unknown): Response {
  const appError = toAppError(error);
  // A 503 is for a while: say when to try again.
  const headers: HeadersInit = appError.status === 503 ? { "retry-after": "30" } : {};
  return Response.json(errorBody(appError), { status: appError.status, headers });
}

type Context<P> = { params: Promise<P> };

/** Wraps a route handler so every failure leaves as the one error shape. */
export function route<P = Record<string, never>>(
  handler: (request: Request, params: P) => Promise<Response>,
): (request: Request, context: Context<P>) => Promise<Response> {
  return async (request, context) => {
    try {
      return await handler(request, (await context?.params) ?? ({} as P));
    } catch (error) {
      return errorResponse(error);
    }
  };
}
