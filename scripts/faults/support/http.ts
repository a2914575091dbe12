// The web app as a browser meets it: sign-in over HTTP, the session cookie carried on
// every call, answers timed. Sign-in is rate-limited per address (5 a minute), so each
// person signs in once per run and the session is reused by every scenario.
export type Session = { email: string; cookie: string; userId: string };

export type Answer = { status: number; ms: number; text: string; json: unknown };

const sessions = new Map<string, Promise<Session>>();

function cookiesFrom(response: Response): string {
  return response.headers
    .getSetCookie()
    .map((c) => c.split(";")[0]!)
    .filter((c) => !c.endsWith("="))
    .join("; ");
}

async function authCall(url: string, path: string, body: unknown): Promise<Response> {
  for (let attempt = 0; ; attempt++) {
    const response = await fetch(`${url}/api/auth${path}`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: url },
      body: JSON.stringify(body),
    });
    if (response.status !== 429 || attempt >= 2) return response;
    const waitS = Number(response.headers.get("retry-after")) || 60;
    await new Promise((resolve) => setTimeout(resolve, Math.min(waitS, 90) * 1000));
  }
}

async function sessionFrom(response: Response, what: string, email: string): Promise<Session> {
  const text = await response.text();
  if (response.status !== 200) throw new Error(`${what} for ${email} answered ${response.status}: ${text.slice(0, 300)}`);
  const json = JSON.parse(text) as { user: { id: string } };
  return { email, cookie: cookiesFrom(response), userId: json.user.id };
}

/** Signs in once per base URL and address for the whole run; later calls get the same session. */
export function signIn(url: string, email: string, password: string): Promise<Session> {
  const key = `${url} ${email}`;
  let session = sessions.get(key);
  if (!session) {
    session = authCall(url, "/sign-in/email", { email, password }).then((r) => sessionFrom(r, "sign-in", email));
    session.catch(() => sessions.delete(key));
    sessions.set(key, session);
  }
  return session;
}

/** A new account, signed in. */
export async function signUp(url: string, account: { email: string; password: string; name: string }): Promise<Session> {
  const session = await sessionFrom(await authCall(url, "/sign-up/email", account), "sign-up", account.email);
  sessions.set(`${url} ${account.email}`, Promise.resolve(session));
  return session;
}

/** One call with the session's cookie; a JSON body is sent as JSON, a string as it is. */
export async function call(url: string, session: Session | null, method: string, path: string, body?: unknown): Promise<Answer> {
  const headers: Record<string, string> = { origin: url };
  if (session) headers.cookie = session.cookie;
  if (body !== undefined) headers["content-type"] = "application/json";
  const started = performance.now();
  const response = await fetch(`${url}${path}`, {
    method,
    headers,
    body: body === undefined ? undefined : typeof body === "string" ? body : JSON.stringify(body),
    redirect: "manual",
  });
  const text = await response.text();
  const ms = performance.now() - started;
  let json: unknown = null;
  try {
    json = JSON.parse(text);
  } catch {
    // Pages and exports are not JSON.
  }
  return { status: response.status, ms, text, json };
}

/** The call, failing loudly unless its status is the expected one. */
export async function expectCall(url: string, session: Session, method: string, path: string, body: unknown, status: number) {
  const answer = await call(url, session, method, path, body);
  if (answer.status !== status) throw new Error(`${method} ${path} answered ${answer.status}, expected ${status}: ${answer.text.slice(0, 300)}`);
  return answer.json as Record<string, unknown>;
}

/** Runs `work` over the items with at most `limit` at once. */
export async function inParallel<T, R>(items: T[], limit: number, work: (item: T, index: number) => Promise<R>): Promise<R[]> {
  const results: R[] = new Array(items.length);
  let next = 0;
  async function worker() {
    while (next < items.length) {
      const index = next++;
      results[index] = await work(items[index]!, index);
    }
  }
  await Promise.all(Array.from({ length: Math.min(limit, items.length) }, worker));
  return results;
}

/** p50, p95 and max of a list of times, rounded to the millisecond. */
export function timeSpread(ms: number[]) {
  const sorted = [...ms].sort((a, b) => a - b);
  const at = (q: number) => Math.round(sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))] ?? 0);
  return { p50: at(0.5), p95: at(0.95), max: Math.round(sorted.at(-1) ?? 0) };
}

/** { "201": 950, "409": 50 } as "201×950 409×50". */
export function statusWords(counts: Record<string, number>) {
  return Object.entries(counts)
    .sort(([a], [b]) => a.localeCompare(b))
    .map(([status, n]) => `${status}×${n}`)
    .join(" ");
}

export function countBy<T>(items: T[], key: (item: T) => string): Record<string, number> {
  const counts: Record<string, number> = {};
  for (const item of items) counts[key(item)] = (counts[key(item)] ?? 0) + 1;
  return counts;
}
