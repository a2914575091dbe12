import { afterEach, describe, expect, it } from "vitest";
import { lineRing, superviseService, type Supervisor } from "@/scripts/supervisor";

const node = process.execPath;
const started: Supervisor[] = [];
afterEach(async () => {
  while (started.length) await started.pop()!.stop();
});

function alive(pid: number) {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

async function until(probe: () => boolean, what: string, ms = 5000) {
  const end = Date.now() + ms;
  while (!probe()) {
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 10));
  }
}

async function supervise(script: string, options: Partial<Parameters<typeof superviseService>[0]> = {}) {
  const said: string[] = [];
  const output: string[] = [];
  const s = await superviseService({
    name: "svc",
    command: node,
    args: ["-e", script],
    env: process.env,
    cwd: process.cwd(),
    firstDelayMs: 20,
    maxDelayMs: 1000,
    say: (line) => said.push(line),
    output: (line) => output.push(line),
    ...options,
  });
  started.push(s);
  return { s, said, output };
}

describe("lineRing", () => {
  it("keeps the last lines, oldest first", () => {
    const ring = lineRing(3);
    for (const line of ["a", "b", "c", "d", "e"]) ring.push(line);
    expect(ring.lines()).toEqual(["c", "d", "e"]);
  });
});

describe("superviseService", () => {
  it("restarts a service that dies, waiting twice as long each time within the window, up to the cap", async () => {
    const { s, said } = await supervise("setTimeout(() => process.exit(3), 30)", { maxDelayMs: 50, maxRestarts: 4, windowMs: 60_000 });
    await s.gaveUp;
    const waits = said.filter((l) => l.includes("restarting it in")).map((l) => l.match(/in ([\d.]+) s/)![1]);
    expect(waits).toEqual(["0.02", "0.04", "0.05", "0.05"]);
    expect(said[0]).toBe("svc stopped unexpectedly (exit 3); restarting it in 0.02 s.");
    expect(said.filter((l) => /^svc restarted \(pid \d+\)\.$/.test(l))).toHaveLength(4);
    expect(s.restarts).toBe(4);
    expect(s.state).toBe("given-up");
  });

  it("gives up after the fifth restart within the window and shows the tail of the output", async () => {
    const script = "for (let i = 0; i < 40; i++) console.log(`line ${i}`); console.error('fatal: broker port taken'); process.exit(1)";
    const { s, said, output } = await supervise(script, { tailLines: 30 });
    await s.gaveUp;
    expect(s.restarts).toBe(5);
    const last = said.at(-1)!;
    expect(last).toMatch(/^svc stopped \(exit 1\) after 5 restarts within 60 s; not restarting it again\. Its last 30 lines:\n/);
    const shown = last.split("\n").slice(1).map((l) => l.trim());
    expect(shown).toHaveLength(30);
    expect(shown.at(-1)).toBe("fatal: broker port taken");
    expect(shown[0]).toBe("line 11");
    expect(output.filter((l) => l === "line 0")).toHaveLength(6);
  });

  it("forgets restarts older than the window", async () => {
    // Each run lives 60 ms; with a 50 ms window every death counts as the first.
    const { s, said } = await supervise("setTimeout(() => process.exit(2), 60)", { maxRestarts: 1, windowMs: 50 });
    await until(() => s.restarts >= 3, "three restarts");
    expect(s.state).not.toBe("given-up");
    expect(said.filter((l) => l.includes("restarting it in")).every((l) => l.includes("in 0.02 s"))).toBe(true);
  });

  it("brings back a service killed with SIGKILL, as a new process", async () => {
    const { s, said } = await supervise("setInterval(() => {}, 1000)");
    const first = s.pid!;
    const next = s.nextStart();
    process.kill(first, "SIGKILL");
    const second = await next;
    expect(second).not.toBe(first);
    expect(s.pid).toBe(second);
    expect(said[0]).toBe("svc stopped unexpectedly (killed by SIGKILL); restarting it in 0.02 s.");
  });

  it("stop() ends the service and what it started, is idempotent, and no restart follows", async () => {
    const script = [
      "const { spawn } = require('node:child_process');",
      "const c = spawn(process.execPath, ['-e', 'setInterval(() => {}, 1000)'], { stdio: 'ignore' });",
      "console.log('child ' + c.pid);",
      "setInterval(() => {}, 1000);",
    ].join("\n");
    const { s, said, output } = await supervise(script);
    await until(() => output.some((l) => l.startsWith("child ")), "the grandchild");
    const grandchild = Number(output.find((l) => l.startsWith("child "))!.slice(6));
    const pid = s.pid!;
    await Promise.all([s.stop(), s.stop()]);
    await s.stop();
    expect(alive(pid)).toBe(false);
    await until(() => !alive(grandchild), "the grandchild to go", 2000);
    await new Promise((resolve) => setTimeout(resolve, 100));
    expect(s.state).toBe("stopped");
    expect(s.restarts).toBe(0);
    expect(said).toEqual([]);
  });

  it("stop() during the wait before a restart cancels the restart", async () => {
    const { s, said } = await supervise("process.exit(4)", { firstDelayMs: 200 });
    await until(() => s.state === "restarting", "the first death");
    await s.stop();
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(s.restarts).toBe(0);
    expect(said).toHaveLength(1);
  });

  it("a service that will not stop on SIGTERM is killed after the timeout", async () => {
    const { s, output } = await supervise("process.on('SIGTERM', () => console.log('ignoring')); console.log('ready'); setInterval(() => {}, 1000)", { stopTimeoutMs: 200 });
    await until(() => output.includes("ready"), "ready");
    const began = Date.now();
    await s.stop();
    expect(Date.now() - began).toBeGreaterThanOrEqual(180);
    expect(output).toContain("ignoring");
  });

  it("refuses to start a program that does not exist", async () => {
    await expect(superviseService({ name: "x", command: "/nonexistent/cloche-program", args: [], env: process.env, cwd: process.cwd() })).rejects.toThrow(/could not start/);
  });
});
