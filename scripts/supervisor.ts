// Keeps one long-running service alive for `npm start`: its own process group, its
// output prefixed with its name and kept as a short tail, and a restart with back-off
// when it dies. A service that keeps dying is given up on, with its last lines shown,
// instead of being restarted forever.
import { spawn, type ChildProcess } from "node:child_process";

export type SupervisorOptions = {
  name: string;
  command: string;
  args: string[];
  env: NodeJS.ProcessEnv;
  cwd: string;
  /** Wait before the first restart; doubled for each restart still inside the window. */
  firstDelayMs: number;
  maxDelayMs: number;
  /** Give up when the service dies again after this many restarts inside `windowMs`. */
  maxRestarts: number;
  windowMs: number;
  /** Lines of output kept to show when giving up. */
  tailLines: number;
  /** After SIGTERM, SIGKILL follows when the service has not stopped within this. */
  stopTimeoutMs: number;
  /** Each line the service writes. */
  output: (line: string, stream: "stdout" | "stderr") => void;
  /** What the supervisor has to say (restarts, giving up). */
  say: (line: string) => void;
};

export const SUPERVISOR_DEFAULTS = {
  firstDelayMs: 1000,
  maxDelayMs: 16_000,
  maxRestarts: 5,
  windowMs: 60_000,
  tailLines: 30,
  stopTimeoutMs: 10_000,
} satisfies Partial<SupervisorOptions>;

export type SupervisorState = "running" | "restarting" | "given-up" | "stopped";

export type Supervisor = {
  readonly name: string;
  readonly state: SupervisorState;
  /** The pid of the running process (the leader of its process group). */
  readonly pid: number | undefined;
  /** Restarts so far, in all. */
  readonly restarts: number;
  /** Times the service stopped without being asked to (each restart follows one). */
  readonly deaths: number;
  /** The service's last lines of output, oldest first. */
  tail(): string[];
  /** Resolves with the pid of the next process started after this call. */
  nextStart(): Promise<number>;
  /** Resolves when the supervisor gives up on the service. */
  readonly gaveUp: Promise<void>;
  /** Stops the service and any restart on its way; idempotent. */
  stop(): Promise<void>;
};

/** The last `capacity` lines. */
export function lineRing(capacity: number) {
  const lines: string[] = [];
  return {
    push(line: string) {
      lines.push(line);
      if (lines.length > capacity) lines.shift();
    },
    lines: () => [...lines],
  };
}

function describeExit(code: number | null, signal: NodeJS.Signals | null) {
  return signal ? `killed by ${signal}` : `exit ${code}`;
}

function killGroup(pid: number, signal: NodeJS.Signals) {
  try {
    process.kill(-pid, signal);
    return true;
  } catch {
    return false;
  }
}

export async function superviseService(
  options: Pick<SupervisorOptions, "name" | "command" | "args" | "env" | "cwd"> & Partial<SupervisorOptions>,
): Promise<Supervisor> {
  const o: SupervisorOptions = {
    ...SUPERVISOR_DEFAULTS,
    output: (line, stream) => (stream === "stdout" ? process.stdout : process.stderr).write(`[${options.name}] ${line}\n`),
    say: (line) => console.error(`[cloche] ${line}`),
    ...options,
  };
  const ring = lineRing(o.tailLines);
  let state: SupervisorState = "running";
  let child: ChildProcess | undefined;
  let exited: Promise<void> = Promise.resolve();
  let restartTimer: NodeJS.Timeout | undefined;
  let restarts = 0;
  let deaths = 0;
  const restartTimes: number[] = [];
  let startWaiters: ((pid: number) => void)[] = [];
  let giveUp!: () => void;
  const gaveUp = new Promise<void>((resolve) => (giveUp = resolve));

  const pipe = (stream: NodeJS.ReadableStream, name: "stdout" | "stderr") => {
    let partial = "";
    const emit = (line: string) => {
      ring.push(line);
      o.output(line, name);
    };
    stream.on("data", (chunk: Buffer) => {
      const lines = (partial + chunk.toString()).split("\n");
      partial = lines.pop() ?? "";
      lines.forEach(emit);
    });
    stream.on("end", () => {
      if (partial) emit(partial);
      partial = "";
    });
  };

  const onDeath = (code: number | null, signal: NodeJS.Signals | null) => {
    if (state === "stopped") return;
    deaths++;
    const now = Date.now();
    while (restartTimes.length && now - restartTimes[0]! > o.windowMs) restartTimes.shift();
    if (restartTimes.length >= o.maxRestarts) {
      state = "given-up";
      const tail = ring.lines();
      o.say(
        `${o.name} stopped (${describeExit(code, signal)}) after ${restartTimes.length} restarts within ${Math.round(o.windowMs / 1000)} s; ` +
          `not restarting it again. Its last ${tail.length} lines:\n` +
          tail.map((line) => `    ${line}`).join("\n"),
      );
      giveUp();
      return;
    }
    const delayMs = Math.min(o.firstDelayMs * 2 ** restartTimes.length, o.maxDelayMs);
    state = "restarting";
    o.say(`${o.name} stopped unexpectedly (${describeExit(code, signal)}); restarting it in ${delayMs / 1000} s.`);
    restartTimer = setTimeout(() => {
      restartTimer = undefined;
      if (state !== "restarting") return;
      restartTimes.push(Date.now());
      restarts++;
      try {
        launch();
        o.say(`${o.name} restarted (pid ${child!.pid}).`);
      } catch (error) {
        o.say(`${o.name} could not be restarted: ${(error as Error).message}`);
        onDeath(null, null);
      }
    }, delayMs);
  };

  function launch() {
    // Its own process group: Ctrl-C reaches the runner alone, which stops the services
    // in order, and a restart can clear out anything the dead process left behind.
    const proc = spawn(o.command, o.args, { cwd: o.cwd, env: o.env, stdio: ["ignore", "pipe", "pipe"], detached: true });
    if (proc.pid === undefined) {
      // spawn reports ENOENT and the like through an error event with no pid.
      proc.on("error", () => {});
      throw new Error(`could not start ${o.command}`);
    }
    child = proc;
    state = "running";
    pipe(proc.stdout!, "stdout");
    pipe(proc.stderr!, "stderr");
    exited = new Promise<void>((resolve) => {
      proc.on("exit", (code, signal) => {
        // Whatever the leader left running in its group goes too, so that a restart
        // finds the ports free and the pipes close.
        killGroup(proc.pid!, "SIGKILL");
        proc.on("close", () => {
          resolve();
          onDeath(code, signal);
        });
      });
    });
    const waiters = startWaiters;
    startWaiters = [];
    for (const wake of waiters) wake(proc.pid);
  }

  launch();

  let stopping: Promise<void> | undefined;
  return {
    name: o.name,
    get state() {
      return state;
    },
    get pid() {
      return state === "running" ? child?.pid : undefined;
    },
    get restarts() {
      return restarts;
    },
    get deaths() {
      return deaths;
    },
    tail: () => ring.lines(),
    nextStart: () => new Promise<number>((resolve) => startWaiters.push(resolve)),
    gaveUp,
    stop() {
      stopping ??= (async () => {
        const wasRunning = state === "running";
        state = "stopped";
        clearTimeout(restartTimer);
        const proc = child;
        if (!wasRunning || !proc?.pid || proc.exitCode !== null || proc.signalCode !== null) {
          await exited;
          return;
        }
        killGroup(proc.pid, "SIGTERM");
        const timer = setTimeout(() => killGroup(proc.pid!, "SIGKILL"), o.stopTimeoutMs);
        await exited;
        clearTimeout(timer);
      })();
      return stopping;
    },
  };
}
