// Finding programs from Debian's packages, and installing a missing package (as root)
// without letting its install script start a system-wide service.
import { spawnSync } from "node:child_process";
import { existsSync, rmSync, writeFileSync } from "node:fs";
import path from "node:path";

const SEARCH_DIRS = ["/usr/sbin", "/usr/bin", "/usr/local/sbin", "/usr/local/bin"];

export class PackageError extends Error {}

export function findProgram(names: string[]): string | undefined {
  const dirs = [...(process.env.PATH ?? "").split(path.delimiter).filter(Boolean), ...SEARCH_DIRS];
  for (const name of names) {
    for (const dir of dirs) {
      const candidate = path.join(dir, name);
      if (existsSync(candidate)) return candidate;
    }
  }
  return undefined;
}

export function isRoot() {
  return typeof process.getuid === "function" && process.getuid() === 0;
}

let updated = false;

/** Installs `pkg` with apt-get; refuses with the command to run when not root. */
export function installDebianPackage(pkg: string, why: string, log: (line: string) => void) {
  if (!isRoot()) {
    throw new PackageError(
      `${why} is not installed. Install Debian's package first:\n` +
        `    sudo apt-get update && sudo apt-get install -y ${pkg}`,
    );
  }
  log(`${why} is not installed: installing Debian's ${pkg} (apt-get)…`);
  // policy-rc.d answering 101 keeps the package from starting its system-wide service.
  const policy = "/usr/sbin/policy-rc.d";
  const ownPolicy = !existsSync(policy);
  if (ownPolicy) writeFileSync(policy, "#!/bin/sh\nexit 101\n", { mode: 0o755 });
  try {
    const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
    const steps = [...(updated ? [] : [["update"]]), ["install", "-y", "--no-install-recommends", pkg]];
    for (const args of steps) {
      const result = spawnSync("apt-get", args, { stdio: ["ignore", "inherit", "inherit"], env });
      if (result.status !== 0) throw new PackageError(`apt-get ${args.join(" ")} failed (exit ${result.status}); see its output above.`);
    }
    updated = true;
  } finally {
    if (ownPolicy) rmSync(policy, { force: true });
  }
}

/** The path of one of `names`, installing `pkg` first when none is there. */
export function ensureProgram(names: string[], pkg: string, why: string, log: (line: string) => void): string {
  const found = findProgram(names);
  if (found) return found;
  installDebianPackage(pkg, why, log);
  const after = findProgram(names);
  if (!after) throw new PackageError(`${pkg} installed, but ${names[0]} was not found.`);
  return after;
}
