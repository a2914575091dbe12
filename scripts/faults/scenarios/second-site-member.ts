// A member of another site (a fresh account with its own site, made by sign-up as any
// new grower would) tries every site-scoped route handler of the demo site with each
// method and example body from the access tables, and every page under /sites/[slug].
// Each must answer 403 or 404, never a 2xx and never a 5xx, and no answer may carry the
// demo's house or plug names.
import { readdirSync, statSync } from "node:fs";
import path from "node:path";
import { randomBytes } from "node:crypto";
import type { FaultContext, FaultResult, FaultScenario } from "../scenario";
import { loadSite, openDb } from "../support/db";
import { call, countBy, inParallel, signUp, statusWords, type Answer } from "../support/http";
import { siteRouteCases } from "../support/route-cases";

const root = path.resolve(import.meta.dirname, "../../..");

function pages(dir: string): string[] {
  return readdirSync(dir).flatMap((entry) => {
    const full = path.join(dir, entry);
    if (statSync(full).isDirectory()) return pages(full);
    return entry === "page.tsx" ? [full] : [];
  });
}

type Tried = { what: string; answer: Answer | null; error?: string };

async function run(context: FaultContext): Promise<FaultResult> {
  const failures: string[] = [];
  const db = openDb(context.databaseUrl);
  const demo = await loadSite(db);
  await db.end();
  const plug = demo.plugs[0]!;
  const ids = { siteId: demo.id, houseId: plug.houseId, plugId: plug.id, sensorId: demo.sensors[0]!.id };
  const secrets = [...demo.houses.map((h) => h.name), ...demo.plugs.map((p) => p.name), ...demo.sensors.map((s) => s.name)];

  const tag = randomBytes(4).toString("hex");
  const member = await signUp(context.url, {
    email: `second-${tag}@faults.example`,
    password: `second-site-${tag}`,
    name: "Second Site Grower",
  });
  context.log(`signed up second-${tag}@faults.example with a site of their own`);

  const { cases, unlisted } = await siteRouteCases(ids);
  if (unlisted.length) failures.push(`handlers missing from the access tables, not tried: ${unlisted.join(", ")}`);
  const pageFiles = pages(path.join(root, "app/sites/[slug]")).map((f) => path.relative(path.join(root, "app/sites/[slug]"), path.dirname(f)));
  const pagePaths = pageFiles.map((rel) =>
    `/sites/${demo.slug}/${rel}`
      .replace("[plugId]", plug.id)
      .replace("[houseId]", plug.houseId)
      .replace("[kind]/[id]", `plug/${plug.id}`)
      .replace(/\/$/, ""),
  );
  context.log(`${cases.length} route cases and ${pagePaths.length} pages, with the demo site's ids`);

  const tries = [
    ...cases.map((c) => ({ what: `${c.method} ${c.path}`, method: c.method, path: c.path, body: c.body })),
    ...pagePaths.map((p) => ({ what: `page ${p}`, method: "GET", path: p, body: undefined })),
  ];
  const tried = await inParallel(tries, 8, async (t): Promise<Tried> => {
    try {
      return { what: t.what, answer: await call(context.url, member, t.method, t.path, t.body) };
    } catch (error) {
      return { what: t.what, answer: null, error: error instanceof Error ? error.message : String(error) };
    }
  });

  const statuses = countBy(tried, (t) => (t.answer ? String(t.answer.status) : "no answer"));
  context.log(`answers: ${statusWords(statuses)}`);
  let serverErrors = 0;
  for (const t of tried) {
    if (!t.answer) {
      failures.push(`${t.what}: no answer (${t.error})`);
      continue;
    }
    const { status, text } = t.answer;
    if (status >= 500) serverErrors++;
    if (status !== 403 && status !== 404) failures.push(`${t.what} answered ${status}`);
    const leaked = secrets.filter((name) => text.includes(name));
    if (leaked.length) failures.push(`${t.what} (${status}) carries the demo's ${leaked.slice(0, 3).join(", ")}`);
  }
  return {
    figures: { switchesLost: null, switchesDoubled: null, longestControlGapMs: null, crashes: null, serverErrors },
    extra: { routeCases: cases.length, pages: pagePaths.length, statuses: statusWords(statuses), unlisted: unlisted.length },
    failures,
  };
}

export const secondSiteMember: FaultScenario = {
  name: "second-site-member",
  quick: true,
  about: "a member of another site tries every site-scoped route (each method, example bodies) and every site page of the demo site; only 403/404, no 5xx, none of the demo's names",
  run,
};
