// Sending a form's JSON to a route handler and reading the one error shape back.
import type { ErrorBody, FieldErrors } from "@/lib/errors";

export type ApiFailure = { message: string; fields: FieldErrors; status: number | null };
export type ApiResult<T> = { ok: true; data: T } | { ok: false; error: ApiFailure };

export async function sendJson<T>(url: string, method: "POST" | "PATCH" | "PUT" | "DELETE", body?: unknown): Promise<ApiResult<T>> {
  let response: Response;
  try {
    response = await fetch(url, {
      method,
      headers: body === undefined ? {} : { "content-type": "application/json" },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
  } catch {
    return { ok: false, error: { message: "Could not reach Cloche. Check your connection and try again.", fields: {}, status: null } };
  }
  const json = (await response.json().catch(() => null)) as T | ErrorBody | null;
  if (response.ok) return { ok: true, data: json as T };
  const error = json && typeof json === "object" && "error" in json ? json.error : null;
  return {
    ok: false,
    error: {
      message: error?.message ?? `Cloche answered with status ${response.status}. Please try again.`,
      fields: error?.fields ?? {},
      status: response.status,
    },
  };
}

/**
 * Puts a failure's field messages on the form's fields that exist; returns what is
 * left to show above the form (null when every message found its field).
 */
export function placeFieldErrors(failure: ApiFailure, fields: readonly string[], setError: (name: string, message: string) => void): string | null {
  const placed = Object.entries(failure.fields).filter(([name]) => fields.includes(name));
  for (const [name, message] of placed) setError(name, message);
  return placed.length > 0 && placed.length === Object.keys(failure.fields).length ? null : failure.message;
}
