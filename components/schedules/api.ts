// The editor's calls to its handlers: JSON in and out, and the server's AppError kept
// whole so that its field messages reach the fields.
import type { FieldErrors } from "@/lib/errors";

export class ApiError extends Error {
  readonly status: number | null;
  readonly fields: FieldErrors;
  constructor(message: string, status: number | null, fields: FieldErrors = {}) {
    super(message);
    this.name = "ApiError";
    this.status = status;
    this.fields = fields;
  }
}

export async function sendJson<T>(method: "POST" | "PUT", url: string, body: unknown): Promise<T> {
  let response: Response;
  try {
    response = await fetch(url, { method, headers: { "content-type": "application/json", accept: "application/json" }, body: JSON.stringify(body) });
  } catch {
    throw new ApiError("Cloche can’t be reached from this device right now. Your changes are still here; try again.", null);
  }
  const json = (await response.json().catch(() => null)) as { error?: { message?: string; fields?: FieldErrors } } | null;
  if (!response.ok) {
    throw new ApiError(json?.error?.message ?? `The server answered with status ${response.status}.`, response.status, json?.error?.fields ?? {});
  }
  return json as T;
}

export const postJson = <T,>(url: string, body: unknown) => sendJson<T>("POST", url, body);
