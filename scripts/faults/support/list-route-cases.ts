// Run as a child process (node --conditions=react-server --import tsx): loads the
// access tables of tests/integration/access/*.ts, which import the route handlers
// themselves, and prints every site-scoped case as JSON for the ids given, with the
// handler methods that no table lists.
import { readdirSync, statSync } from "node:fs";
import path from "node:path";
import { pathToFileURL } from "node:url";
import type { Ids, RouteCase } from "../../../tests/integration/access/case";

const root = path.resolve(import.meta.dirname, "../../..");
const METHODS = ["GET", "POST", "PUT", "PATCH", "DELETE"] as const;

function files(dir: string, name: string): string[] {
  return readdirSync(dir).flatMap((entry) => {
    const full = path.join(dir, entry);
    if (statSync(full).isDirectory()) return files(full, name);
    return entry === name ? [full] : [];
  });
}

const ids = JSON.parse(process.argv[2] ?? "{}") as Ids;
const accessDir = path.join(root, "tests/integration/access");
const cases: RouteCase[] = [];
for (const file of readdirSync(accessDir).filter((f) => f.endsWith(".ts") && f !== "case.ts")) {
  const mod = (await import(pathToFileURL(path.join(accessDir, file)).href)) as { cases?: RouteCase[] };
  cases.push(...(mod.cases ?? []));
}

const listed = new Set(cases.map((c) => `${c.method} ${c.file}`));
const unlisted: string[] = [];
for (const full of files(path.join(root, "app/api/sites/[siteId]"), "route.ts")) {
  const file = path.relative(root, full);
  const mod = (await import(pathToFileURL(full).href)) as Record<string, unknown>;
  for (const method of METHODS) if (typeof mod[method] === "function" && !listed.has(`${method} ${file}`)) unlisted.push(`${method} ${file}`);
}

const out = cases
  .filter((c) => c.siteScoped)
  .map((c) => ({ file: c.file, method: c.method, path: c.path(ids), body: c.body, write: c.write }));
process.stdout.write(JSON.stringify({ cases: out, unlisted }));
process.exit(0);
