// The members' and activity pages' calls to the API: JSON in, JSON out, and the API's
// one error shape turned into an Error with the message to show.
export class ApiError extends Error {
  readonly status: number | null;
  readonly fields?: Record<string, string>;
  constructor(message: string, status: number | null, fields?: Record<string, string>) {
    super(message);
    this.name = "ApiError";
    this.status = status;
    this.fields = fields;
  }
}

export async function requestJson<T>(url: string, init: { method?: string; body?: unknown } = {}): Promise<T> {
  let response: Response;
  try {
    response = await fetch(url, {
      method: init.method ?? "GET",
      headers: { accept: "application/json", ...(init.body !== undefined ? { "content-type": "application/json" } : {}) },
      body: init.body !== undefined ? JSON.stringify(init.body) : undefined,
      cache: "no-store",
    });
  } catch {
    throw new ApiError("Cloche can’t be reached from this device right now. Check the connection and try again.", null);
  }
  if (response.status === 204) return undefined as T;
  const body = (await response.json().catch(() => null)) as { error?: { message?: string; fields?: Record<string, string> } } | null;
  if (!response.ok) {
    throw new ApiError(body?.error?.message ?? `The server answered with status ${response.status}.`, response.status, body?.error?.fields);
  }
  return body as T;
}

export const getJson = <T,>(url: string) => requestJson<T>(url);

/** "14 Mar 2026" in the site's zone. */
export function formatDay(at: string | Date, timeZone: string): string {
  return new Intl.DateTimeFormat("en-GB", { timeZone, day: "numeric", month: "short", year: "numeric" }).format(new Date(at));
}

/** "14 Mar 2026, 18:05" in the site's zone. */
export function formatMoment(at: string | Date, timeZone: string): string {
  return new Intl.DateTimeFormat("en-GB", { timeZone, day: "numeric", month: "short", year: "numeric", hour: "2-digit", minute: "2-digit", hourCycle: "h23" }).format(new Date(at));
}
