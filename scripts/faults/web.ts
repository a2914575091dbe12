// The web app as the fault suite sees it: a signed-in member, and requests timed.
export type Timed = { status: number | "no answer"; ms: number };

export async function signIn(url: string, email: string, password: string): Promise<string> {
  const response = await fetch(`${url}/api/auth/sign-in/email`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: url },
    body: JSON.stringify({ email, password }),
  });
  if (!response.ok) throw new Error(`sign-in as ${email} answered ${response.status}`);
  const cookies = response.headers.getSetCookie().map((c) => c.split(";")[0]);
  if (!cookies.length) throw new Error(`sign-in as ${email} set no cookie`);
  return cookies.join("; ");
}

/** One GET, given up after `timeoutMs` ("no answer"). */
export async function timedGet(url: string, cookie: string, timeoutMs: number): Promise<Timed> {
  const began = performance.now();
  try {
    const response = await fetch(url, { headers: { cookie }, redirect: "manual", signal: AbortSignal.timeout(timeoutMs) });
    await response.arrayBuffer();
    return { status: response.status, ms: Math.round(performance.now() - began) };
  } catch {
    return { status: "no answer", ms: Math.round(performance.now() - began) };
  }
}

/** Asks for each path every `everyMs` until `until()` says stop; every answer kept. */
export async function probeWhile(base: string, paths: string[], cookie: string, o: { everyMs: number; timeoutMs: number; until: () => boolean }) {
  const answers: (Timed & { path: string })[] = [];
  while (!o.until()) {
    const round = await Promise.all(paths.map(async (p) => ({ path: p, ...(await timedGet(base + p, cookie, o.timeoutMs)) })));
    answers.push(...round);
    await new Promise((resolve) => setTimeout(resolve, o.everyMs));
  }
  return answers;
}
