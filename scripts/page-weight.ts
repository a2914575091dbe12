// The JavaScript a phone downloads for the houses page and the override page,
// compressed, beside each page's budget (issue 11: houses with charts 200 kB, override
// 150 kB).
//
//   npm start (or `next build` + `next start`), then:
//   tsx scripts/page-weight.ts [base URL, default http://127.0.0.1:3000]
//
// What is measured is what the page actually loads: the page is fetched from the
// running server as a signed-in demo member (PAGE_WEIGHT_EMAIL / PAGE_WEIGHT_PASSWORD,
// the demo grower by default), and every `<script src>` of its HTML is fetched and
// gzipped (zlib level 9 — about what `next start` sends; the server's own encoding is
// not relied on). `nomodule` scripts (legacy polyfills) are left out: a phone that runs
// modules never downloads them. Chunks the page loads later on its own (the chart's
// uPlot, imported with next/dynamic) are the chunk paths named inside the first-load
// chunks (Turbopack's loader lists them) that the HTML did not load; they are counted
// too and shown apart.
import { gzipSync } from "node:zlib";
import { DEMO_MEMBERS, DEMO_SITE, demoId } from "../db/seed";

type PageSpec = { name: string; path: string; budgetKB: number };

const base = (process.argv[2] ?? process.env.PAGE_WEIGHT_BASE_URL ?? "http://127.0.0.1:3000").replace(/\/$/, "");
const grower = DEMO_MEMBERS.find((m) => m.role === "grower")!;
const email = process.env.PAGE_WEIGHT_EMAIL ?? grower.email;
const password = process.env.PAGE_WEIGHT_PASSWORD ?? grower.password;
const plugId = demoId("plug:glass-heater");

const pages: PageSpec[] = [
  // The houses page draws its charts with uPlot, loaded after the first paint.
  { name: "houses (with charts)", path: `/sites/${DEMO_SITE.slug}`, budgetKB: 200 },
  { name: "override", path: `/sites/${DEMO_SITE.slug}/plugs/${plugId}/override`, budgetKB: 150 },
];

const kB = (bytes: number) => (bytes / 1000).toFixed(1);

async function signIn(): Promise<string> {
  const response = await fetch(`${base}/api/auth/sign-in/email`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: base },
    body: JSON.stringify({ email, password }),
  });
  if (!response.ok) throw new Error(`sign-in as ${email} failed: ${response.status} ${await response.text()}`);
  return response.headers
    .getSetCookie()
    .map((c) => c.split(";")[0]!)
    .join("; ");
}

const bodies = new Map<string, Promise<string>>();
function fetchText(url: string, cookie = ""): Promise<string> {
  let body = bodies.get(url);
  if (!body) {
    body = fetch(url, { headers: cookie ? { cookie } : {} }).then(async (r) => {
      if (!r.ok) throw new Error(`${url}: ${r.status}`);
      return r.text();
    });
    bodies.set(url, body);
  }
  return body;
}

const gz = (text: string) => gzipSync(Buffer.from(text), { level: 9 }).length;

function scriptSources(html: string): string[] {
  const tags = [...html.matchAll(/<script\b[^>]*>/g)].map((m) => m[0]).filter((tag) => !/\snomodule\b/i.test(tag));
  const sources = tags.flatMap((tag) => {
    const src = /\ssrc="([^"]+)"/.exec(tag)?.[1];
    return src ? [src.replace(/&amp;/g, "&")] : [];
  });
  return [...new Set(sources)];
}

/** Chunk paths named inside JavaScript (how the bundler's runtime finds chunks to load on demand). */
function chunkPaths(js: string): string[] {
  return [...new Set([...js.matchAll(/(?:\/_next\/)?static\/chunks\/[A-Za-z0-9_.~\-/]+?\.js/g)].map((m) => `/_next/${m[0].replace(/^\/_next\//, "")}`))];
}

async function measure(page: PageSpec, cookie: string) {
  const response = await fetch(`${base}${page.path}`, { headers: { cookie }, redirect: "manual" });
  if (response.status !== 200) return { page, status: response.status, first: [], lazy: [] };
  const html = await response.text();
  const first = await Promise.all(
    scriptSources(html).map(async (src) => {
      const text = await fetchText(new URL(src, base).href);
      return { src, text, bytes: gz(text) };
    }),
  );
  const loaded = new Set(first.map((f) => new URL(f.src, base).pathname));
  const candidates = [...new Set(first.flatMap((f) => chunkPaths(f.text)))].filter((p) => !loaded.has(p));
  const lazy = [];
  for (const path of candidates) {
    const text = await fetchText(`${base}${path}`).catch(() => null);
    if (text) lazy.push({ src: path, bytes: gz(text) });
  }
  return { page, status: 200, first, lazy };
}

const cookie = await signIn();
let over = false;
console.log(`JavaScript per page, gzip (level 9), from ${base}:`);
for (const spec of pages) {
  const { page, status, first, lazy } = await measure(spec, cookie);
  if (status !== 200) {
    console.log(`  ${page.name.padEnd(22)} ${page.path}: answered ${status} — not measured`);
    continue;
  }
  const firstBytes = first.reduce((s, f) => s + f.bytes, 0);
  const lazyBytes = lazy.reduce((s, f) => s + f.bytes, 0);
  const total = firstBytes + lazyBytes;
  const ok = total <= page.budgetKB * 1000;
  over ||= !ok;
  console.log(
    `  ${page.name.padEnd(22)} ${kB(total).padStart(6)} kB of ${page.budgetKB} kB ${ok ? "ok" : "OVER BUDGET"}` +
      `  (first load ${kB(firstBytes)} kB in ${first.length} scripts${lazy.length ? `; loaded after paint ${kB(lazyBytes)} kB in ${lazy.length}` : ""})`,
  );
  if (process.env.PAGE_WEIGHT_DETAIL) {
    for (const f of [...first, ...lazy].sort((a, b) => b.bytes - a.bytes)) console.log(`      ${kB(f.bytes).padStart(6)} kB  ${f.src}`);
  }
}
process.exitCode = over ? 1 : 0;
