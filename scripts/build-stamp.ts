// Decides whether `next build` must run: a hash of exactly what the build reads. The
// app's own folders and config files, plus every project module they import (followed
// through `@/` and relative imports), so that the db modules the pages use count and
// the runners, controller, simulated devices, seed and tests do not.
import { createHash } from "node:crypto";
import { existsSync, readdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import path from "node:path";
import { root } from "./common";

const FOLDERS = ["app", "components", "lib"];
const FILES = [
  "proxy.ts",
  "instrumentation.ts",
  "next.config.ts",
  "postcss.config.mjs",
  "tailwind.config.ts",
  "tsconfig.json",
  "package-lock.json",
];
const MODULE = /\.(ts|tsx|mts|js|mjs|jsx)$/;
const RESOLVE_SUFFIXES = ["", ".ts", ".tsx", ".js", ".mjs", "/index.ts", "/index.tsx"];
const IMPORT = /(?:\bfrom\s*|\bimport\s*\(\s*|\bimport\s+)["']([^"']+)["']/g;

function walk(entry: string, out: Set<string>) {
  const full = path.join(root, entry);
  if (!existsSync(full)) return;
  if (statSync(full).isDirectory()) {
    for (const name of readdirSync(full)) walk(path.join(entry, name), out);
  } else {
    out.add(entry);
  }
}

/** The project file an import names, or undefined for a package (or a file that is not there). */
export function resolveImport(fromFile: string, specifier: string): string | undefined {
  let base: string;
  if (specifier.startsWith("@/")) base = specifier.slice(2);
  else if (specifier.startsWith(".")) base = path.join(path.dirname(fromFile), specifier);
  else return undefined;
  for (const suffix of RESOLVE_SUFFIXES) {
    const candidate = path.normalize(base + suffix);
    const full = path.join(root, candidate);
    if (existsSync(full) && statSync(full).isFile()) return candidate;
  }
  return undefined;
}

/** Every file the web app is built from, relative to the project root, sorted. */
export function buildInputs(): string[] {
  const files = new Set<string>();
  for (const folder of FOLDERS) walk(folder, files);
  for (const file of FILES) walk(file, files);
  const queue = [...files].filter((file) => MODULE.test(file));
  while (queue.length) {
    const file = queue.pop()!;
    for (const match of readFileSync(path.join(root, file), "utf8").matchAll(IMPORT)) {
      const target = resolveImport(file, match[1]!);
      if (target && !files.has(target) && !target.startsWith("node_modules")) {
        files.add(target);
        if (MODULE.test(target)) queue.push(target);
      }
    }
  }
  return [...files].sort();
}

export function sourceHash() {
  const hash = createHash("sha256");
  for (const file of buildInputs()) {
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
