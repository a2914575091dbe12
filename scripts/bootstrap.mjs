// Entry point of `npm start`, `npm test` and the other commands a fresh clone may run
// first (`npm run faults`, `npm run backup`, `npm run restore`). Plain Node, no
// dependencies: it installs them when they are missing or out of date, then hands
// over to the TypeScript runner under tsx.
import { spawnSync, spawn } from "node:child_process";
import { existsSync, readFileSync } from "node:fs";
import { createHash } from "node:crypto";
import path from "node:path";
import { fileURLToPath } from "node:url";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const command = process.argv[2];
const COMMANDS = ["start", "test", "faults", "backup", "restore"];
if (!COMMANDS.includes(command)) {
  console.error(`usage: node scripts/bootstrap.mjs ${COMMANDS.join("|")}`);
  process.exit(2);
}

const [major, minor] = process.versions.node.split(".").map(Number);
if (major < 20 || (major === 20 && minor < 19)) {
  console.error(`Cloche needs Node.js 20.19 or newer; this is ${process.versions.node}.`);
  process.exit(1);
}

function lockHash() {
  return createHash("sha256").update(readFileSync(path.join(root, "package-lock.json"))).digest("hex");
}

// npm writes node_modules/.package-lock.json on every install; we keep our own stamp
// of the lock file that was installed, so an edited lock triggers a new `npm ci`.
const stampFile = path.join(root, "node_modules", ".cloche-installed");
const installed = existsSync(stampFile) ? readFileSync(stampFile, "utf8").trim() : "";
if (!existsSync(path.join(root, "node_modules", ".bin", "tsx")) || installed !== lockHash()) {
  console.log("[cloche] installing dependencies (npm ci)…");
  const result = spawnSync("npm", ["ci", "--no-audit", "--no-fund"], { cwd: root, stdio: "inherit" });
  if (result.status !== 0) {
    console.error("[cloche] npm ci failed; see the output above.");
    process.exit(result.status ?? 1);
  }
  const { writeFileSync } = await import("node:fs");
  writeFileSync(stampFile, lockHash() + "\n");
}

const tsx = path.join(root, "node_modules", ".bin", "tsx");
const child = spawn(tsx, [path.join(root, "scripts", `${command}.ts`), ...process.argv.slice(3)], {
  cwd: root,
  stdio: "inherit",
});
// The runner handles SIGINT/SIGTERM itself (it shares our process group for Ctrl-C);
// forward a TERM sent to us alone.
for (const signal of ["SIGTERM", "SIGHUP"]) {
  process.on(signal, () => child.kill(signal));
}
process.on("SIGINT", () => {});
child.on("exit", (code, signal) => process.exit(code ?? (signal ? 1 : 0)));
