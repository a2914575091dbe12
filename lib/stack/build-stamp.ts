// Decides whether `next build` must run: a hash of everything the build reads.
import { createHash } from "node:crypto";
import { existsSync, readdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import path from "node:path";
import { root } from "./common";

const INPUTS = [
  "app",
  "components",
  "lib",
  "db",
  "proxy.ts",
  "instrumentation.ts",
  "next.config.mjs",
  "postcss.config.mjs",
  "tailwind.config.ts",
  "tsconfig.json",
  "package-lock.json",
];

function walk(entry: string, out: string[]) {
  const full = path.join(root, entry);
  if (!existsSync(full)) return;
  if (statSync(full).isDirectory()) {
    for (const name of readdirSync(full).sort()) walk(path.join(entry, name), out);
  } else {
    out.push(entry);
  }
}

export function sourceHash() {
  const files: string[] = [];
  for (const entry of INPUTS) walk(entry, files);
  const hash = createHash("sha256");
  for (const file of files) {
    hash.update(file + "\0");
    hash.update(readFileSync(path.join(root, file)));
    hash.update("\0");
  }
  return hash.digest("hex");
}

const stampFile = path.join(root, ".next", "cloche-source-hash");

export function buildIsCurrent(hash: string) {
  return existsSync(path.join(root, ".next", "BUILD_ID")) && existsSync(stampFile) && readFileSync(stampFile, "utf8").trim() === hash;
}

export function markBuilt(hash: string) {
  writeFileSync(stampFile, hash + "\n");
}
