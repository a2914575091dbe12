// Shared pieces of the `npm start` and `npm test` runners.
import { spawn } from "node:child_process";
import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import net from "node:net";
import path from "node:path";
import { fileURLToPath } from "node:url";

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
export const dataFolder = path.join(root, ".data");

export function say(line: string) {
  console.log(`[cloche] ${line}`);
}

/** A secret kept in .data/ so sessions survive restarts; the environment wins when set. */
export function persistentSecret(name: string, envValue: string | undefined) {
  if (envValue) return envValue;
  mkdirSync(dataFolder, { recursive: true });
  const file = path.join(dataFolder, name);
  if (!existsSync(file)) writeFileSync(file, randomBytes(32).toString("base64url") + "\n", { mode: 0o600 });
  return readFileSync(file, "utf8").trim();
}

export function bin(name: string) {
  return path.join(root, "node_modules", ".bin", name);
}

/** Runs a command to completion with inherited output; resolves with its exit code. */
export function run(command: string, args: string[], env: NodeJS.ProcessEnv): Promise<number> {
  return new Promise((resolve, reject) => {
    const child = spawn(command, args, { cwd: root, env, stdio: "inherit" });
    child.on("error", reject);
    child.on("exit", (code, signal) => resolve(code ?? (signal ? 128 : 1)));
  });
}

export function portIsFree(port: number, host = "127.0.0.1"): Promise<boolean> {
  return new Promise((resolve) => {
    const server = net.createServer();
    server.once("error", () => resolve(false));
    server.listen({ port, host, exclusive: true }, () => server.close(() => resolve(true)));
  });
}

export async function waitForHttp(url: string, timeoutMs: number, alive: () => boolean) {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (!alive()) return false;
    try {
      const response = await fetch(url);
      if (response.ok) return true;
    } catch {
      /* not yet listening */
    }
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  return false;
}

/** Waits until something accepts TCP connections on host:port. */
export async function waitForPort(port: number, host: string, timeoutMs: number, alive: () => boolean) {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (!alive()) return false;
    const open = await new Promise<boolean>((resolve) => {
      const socket = net.connect({ port, host }, () => {
        socket.destroy();
        resolve(true);
      });
      socket.once("error", () => resolve(false));
    });
    if (open) return true;
    await new Promise((resolve) => setTimeout(resolve, 200));
  }
  return false;
}
