// Calls the real route handlers in-process, as Next would, with cookies carried over.
import { randomInt, randomUUID } from "node:crypto";
import * as authRoute from "@/app/api/auth/[...all]/route";

export const BASE = "http://127.0.0.1:3000";

type Handler = (request: Request, context: { params: Promise<Record<string, string>> }) => Promise<Response>;

export type CallOptions = {
  method?: string;
  path: string;
  params?: Record<string, string>;
  /** An object is sent as JSON; a string is sent as it is. */
  body?: unknown;
  cookie?: string;
  headers?: Record<string, string>;
  /** The client address the rate limiter sees. */
  ip?: string;
};

export function randomIp() {
  return `10.${randomInt(256)}.${randomInt(256)}.${randomInt(1, 255)}`;
}

export function request({ method = "GET", path, body, cookie, headers = {}, ip }: CallOptions) {
  const init: RequestInit = {
    method,
    headers: {
      origin: BASE,
      "x-forwarded-for": ip ?? randomIp(),
      ...(body !== undefined ? { "content-type": "application/json" } : {}),
      ...(cookie ? { cookie } : {}),
      ...headers,
    },
  };
  if (body !== undefined) init.body = typeof body === "string" ? body : JSON.stringify(body);
  return new Request(`${BASE}${path}`, init);
}

export async function call(handler: unknown, options: CallOptions): Promise<Response> {
  return (handler as Handler)(request(options), { params: Promise.resolve(options.params ?? {}) });
}

export function cookiesFrom(response: Response): string {
  return response.headers
    .getSetCookie()
    .map((c) => c.split(";")[0]!)
    .filter((c) => !c.endsWith("="))
    .join("; ");
}

export async function auth(path: string, body: unknown, options: Partial<CallOptions> = {}) {
  const handler = options.method === "GET" ? authRoute.GET : authRoute.POST;
  return call(handler, { method: "POST", path: `/api/auth${path}`, body, ...options });
}

export type Account = { email: string; password: string; name: string; cookie: string; userId: string };

export async function signUp(extra: Record<string, unknown> = {}): Promise<Account> {
  const email = `grower-${randomUUID().slice(0, 8)}@test.example`;
  const password = "correct-horse-battery";
  const name = "Test Grower";
  const response = await auth("/sign-up/email", { email, password, name, ...extra });
  if (response.status !== 200) throw new Error(`sign-up failed: ${response.status} ${await response.text()}`);
  const json = (await response.json()) as { user: { id: string } };
  return { email, password, name, cookie: cookiesFrom(response), userId: json.user.id };
}

export async function signIn(email: string, password: string): Promise<string> {
  const response = await auth("/sign-in/email", { email, password });
  if (response.status !== 200) throw new Error(`sign-in failed for ${email}: ${response.status} ${await response.text()}`);
  return cookiesFrom(response);
}
