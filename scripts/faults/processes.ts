// The processes of the fault suite's stack that scenarios freeze, kill and start again:
// its private MariaDB, the supervised services (scripts/stack.ts), and one plug run in
// a process of its own (fakes/one-plug.ts) so that it can lose its power.
import { spawn, type ChildProcess } from "node:child_process";
import { existsSync, readFileSync } from "node:fs";
import path from "node:path";
import { startLocalDatabase, type LocalDatabase } from "../local-server";
import { root } from "../common";
import type { Supervisor } from "../supervisor";

export type FaultDatabase = {
  /** mariadbd's pid, from its pid file (undefined while it is not running). */
  pid(): number | undefined;
  /** SIGSTOP: the server holds every connection and answers nothing. */
  freeze(): void;
  /** SIGCONT after a freeze. */
  thaw(): void;
  /** SIGKILL, as a crash or a power cut would. */
  kill(): Promise<void>;
  /** Starts the server again on the same folder and port (after a kill). */
  restart(): Promise<void>;
  stop(): Promise<void>;
};

export function alive(pid: number) {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

async function waitUntil(test: () => boolean, timeoutMs: number) {
  const deadline = Date.now() + timeoutMs;
  while (!test()) {
    if (Date.now() > deadline) return false;
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
  return true;
}

export function faultDatabase(first: LocalDatabase, o: { folder: string; database: string; log: (line: string) => void }): FaultDatabase {
  let current = first;
  const pidFile = path.join(o.folder, "mariadbd.pid");
  const pid = () => {
    if (!existsSync(pidFile)) return undefined;
    const value = Number(readFileSync(pidFile, "utf8").trim());
    return Number.isInteger(value) && value > 0 && alive(value) ? value : undefined;
  };
  const signal = (name: NodeJS.Signals) => {
    const p = pid();
    if (!p) throw new Error("mariadbd is not running");
    process.kill(p, name);
    return p;
  };
  return {
    pid,
    freeze: () => void signal("SIGSTOP"),
    thaw: () => void signal("SIGCONT"),
    async kill() {
      const p = signal("SIGKILL");
      if (!(await waitUntil(() => !alive(p), 10_000))) throw new Error(`mariadbd pid ${p} did not die`);
    },
    async restart() {
      current = await startLocalDatabase({ folder: o.folder, port: current.port, database: o.database, log: o.log });
    },
    stop: () => current.stop(),
  };
}

export type StandalonePlug = {
  readonly device: string;
  readonly pid: number | undefined;
  /** Times it stopped without being killed by a scenario. */
  readonly crashes: number;
  start(): Promise<void>;
  /** SIGKILL: the plug loses its power. */
  kill(): Promise<void>;
  stop(): Promise<void>;
};

export function standalonePlug(o: { device: string; env: NodeJS.ProcessEnv; log: (line: string) => void }): StandalonePlug {
  let child: ChildProcess | undefined;
  let killing = false;
  let crashes = 0;
  const exited = (proc: ChildProcess) => new Promise<void>((resolve) => (proc.exitCode !== null || proc.signalCode !== null ? resolve() : proc.once("exit", () => resolve())));
  return {
    device: o.device,
    get pid() {
      return child?.exitCode === null && child.signalCode === null ? child.pid : undefined;
    },
    get crashes() {
      return crashes;
    },
    async start() {
      const proc = spawn(process.execPath, ["--import", "tsx", "fakes/one-plug.ts"], {
        cwd: root,
        env: { ...o.env, CLOCHE_FAKES_PLUG: o.device, LOG_LEVEL: "warn" },
        stdio: ["ignore", "inherit", "inherit"],
      });
      child = proc;
      killing = false;
      proc.once("exit", (code, sig) => {
        if (!killing) {
          crashes++;
          o.log(`plug ${o.device} stopped unexpectedly (${sig ?? `exit ${code}`})`);
        }
      });
    },
    async kill() {
      if (!child?.pid || child.exitCode !== null || child.signalCode !== null) return;
      killing = true;
      child.kill("SIGKILL");
      await exited(child);
    },
    async stop() {
      if (!child?.pid || child.exitCode !== null || child.signalCode !== null) return;
      killing = true;
      child.kill("SIGTERM");
      const timer = setTimeout(() => child?.kill("SIGKILL"), 5000);
      await exited(child);
      clearTimeout(timer);
    },
  };
}

/** What the runner gives the scenarios that work on processes (FaultContext.processes). */
export type FaultProcesses = {
  database: FaultDatabase;
  /** The supervised services by name: controller, fakes, mail-sink, web. */
  service(name: string): Supervisor;
  /** The demo plug that runs in its own process. */
  plug: StandalonePlug;
  /** Where every simulated plug appends its journal (fakes/journal.ts). */
  journalFile: string;
  /** The stack's environment (service MQTT secrets among it). */
  env: NodeJS.ProcessEnv;
  /** Tells the crash count that the next stop of this service is the scenario's doing. */
  expectStop(service: string): void;
};
