// Importing a thermometer app's CSV into a sensor's history, through the route
// handlers, against the real MariaDB: previews, imports, refusals that write nothing,
// a re-import that adds nothing, the limits, the streamed progress, who may import,
// and the imported minutes in the house chart and the degree-days.
import { randomUUID } from "node:crypto";
import { and, count, eq, gte, lt } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { getDegreeDayReport } from "@/db/queries/degree-days";
import { getHouseChart } from "@/db/queries/house-chart";
import { auditLog, houses, readingImports, readingMinutes, sensors, sites } from "@/db/schema";
import { DEMO_MEMBERS, DEMO_SITE, demoId, seedDemo } from "@/db/seed";
import * as sitesRoute from "@/app/api/sites/route";
import * as importRoute from "@/app/api/sites/[siteId]/sensors/[sensorId]/import/route";
import * as previewRoute from "@/app/api/sites/[siteId]/sensors/[sensorId]/import/preview/route";
import type { ReadingImportOptions } from "@/lib/schemas/reading-import";
import { BASE, call, signIn, signUp, type Account } from "../support/http";

const db = getDb();
const MIN = 60_000;
const HOUR = 3_600_000;

let owner: Account;
let siteId: string;
let houseId: string;
/** The house of the tests' own loggers, apart from the one charted and reported on below. */
let benchHouseId: string;
let insideId: string;
let outsideId: string;

const options: ReadingImportOptions = { timeColumn: "Time", temperatureColumn: "Temperature", humidityColumn: "Humidity", dateFormat: "iso", timeZone: "Europe/London", unit: "c", decimal: "." };

type Json = Record<string, unknown> & { error?: { code: string; message: string; fields?: Record<string, string> } };

function send(
  handler: unknown,
  { sensorId, file, opts = {}, cookie = owner.cookie, accept, site = siteId, fileName = "export.csv" }: { sensorId: string; file: string | Uint8Array; opts?: Partial<ReadingImportOptions>; cookie?: string; accept?: string; site?: string; fileName?: string },
): Promise<Response> {
  const query = new URLSearchParams({ ...options, ...opts, fileName }).toString();
  const request = new Request(`${BASE}/api/sites/${site}/sensors/${sensorId}/import?${query}`, {
    method: "POST",
    headers: { origin: BASE, cookie, "content-type": "text/csv", ...(accept ? { accept } : {}) },
    body: file as BodyInit,
  });
  return (handler as (r: Request, c: { params: Promise<Record<string, string>> }) => Promise<Response>)(request, { params: Promise.resolve({ siteId: site, sensorId }) });
}
const json = async (response: Response) => (await response.json()) as Json;

/** ISO local times (Europe/London in winter = UTC) every `stepMs` from `fromMs`. */
function csv(fromMs: number, n: number, { stepMs = MIN, line = (t: string, i: number) => `${t},${(5 + (i % 100) / 10).toFixed(1)},${60 + (i % 30)}`, head = "Time,Temperature,Humidity", eol = "\n" } = {}) {
  const rows = [head];
  for (let i = 0; i < n; i++) rows.push(line(new Date(fromMs + i * stepMs).toISOString().slice(0, 19).replace("T", " "), i));
  return rows.join(eol) + eol;
}

async function minutesOf(sensorId: string) {
  return db.select().from(readingMinutes).where(eq(readingMinutes.sensorId, sensorId)).orderBy(readingMinutes.minute);
}
async function importsOf(sensorId: string) {
  return db.select().from(readingImports).where(eq(readingImports.sensorId, sensorId));
}

beforeAll(async () => {
  owner = await signUp({ siteName: "Import Nursery" });
  const listed = (await json(await call(sitesRoute.GET, { path: "/api/sites", cookie: owner.cookie }))) as { sites: { id: string }[] };
  siteId = listed.sites[0]!.id;
  await db.update(sites).set({ timeZone: "Europe/London" }).where(eq(sites.id, siteId));
  houseId = randomUUID();
  benchHouseId = randomUUID();
  insideId = randomUUID();
  outsideId = randomUUID();
  await db.insert(houses).values({ id: houseId, siteId, name: "Propagation", kind: "glasshouse", lengthM: 6, widthM: 3, eaveHeightM: 2, ridgeHeightM: 2.8, glazing: "single_glass" });
  await db.insert(houses).values({ id: benchHouseId, siteId, name: "Bench tests", kind: "polytunnel", lengthM: 6, widthM: 3, eaveHeightM: 2, ridgeHeightM: 2.8, glazing: "single_glass" });
  await db.insert(sensors).values([
    { id: insideId, siteId, houseId, deviceId: `in-${insideId.slice(0, 6)}`, name: "Bench air", placement: "inside" },
    { id: outsideId, siteId, houseId, deviceId: `out-${outsideId.slice(0, 6)}`, name: "North wall", placement: "outside" },
  ]);
});

// The files share one database: the test's own site and the demo site's probe go, with their minutes and imports.
const probes: string[] = [];
afterAll(async () => {
  for (const id of probes) await db.delete(sensors).where(eq(sensors.id, id));
  await db.delete(sites).where(eq(sites.id, siteId));
});

async function freshSensor(placement: "inside" | "outside" = "inside") {
  const id = randomUUID();
  await db.insert(sensors).values({ id, siteId, houseId: benchHouseId, deviceId: `s-${id.slice(0, 8)}`, name: `Logger ${id.slice(0, 4)}`, placement });
  return id;
}

describe("a good file", () => {
  it("previews, imports every minute with its summary, records the import and the audit entry, and a second import adds nothing", async () => {
    const sensorId = await freshSensor();
    const start = Date.UTC(2026, 0, 10, 8);
    // Two readings a minute for 90 minutes: 180 rows, 90 minutes.
    const file = csv(start, 180, { stepMs: 30_000, line: (t, i) => `${t},${i % 2 ? 11 : 10},${i % 2 ? 70 : 60}` });

    const preview = await json(await send(previewRoute.POST, { sensorId, file }));
    expect(preview).toMatchObject({ rows: 180, good: 180, bad: 0, problems: [], minutes: 90, newMinutes: 90, minutesAlreadyThere: 0, firstAt: start, lastAt: start + 179 * 30_000, note: null });
    expect((preview.preview as unknown[]).length).toBe(20);
    expect((preview.preview as unknown[])[1]).toEqual({ line: 3, time: "2026-01-10 08:00:30", at: start + 30_000, tempC: 11, rh: 70, problem: null });
    expect(await minutesOf(sensorId)).toEqual([]);

    const response = await send(importRoute.POST, { sensorId, file, fileName: "bench.csv" });
    expect(response.status).toBe(201);
    const body = await json(response);
    expect(body.import).toMatchObject({ rowsRead: 180, minutesAdded: 90, minutesAlreadyThere: 0, fileName: "bench.csv" });
    const stored = await minutesOf(sensorId);
    expect(stored).toHaveLength(90);
    expect(stored[0]).toMatchObject({ minute: new Date(start), samples: 2, tempMinC: 10, tempMaxC: 11, tempMeanC: 10.5, rhMean: 65 });
    const [record] = await importsOf(sensorId);
    expect(record).toMatchObject({ siteId, fileName: "bench.csv", rowsRead: 180, minutesAdded: 90, minutesAlreadyThere: 0, firstAt: new Date(start), importedBy: owner.userId, options });
    expect(record!.fileSha256).toMatch(/^[0-9a-f]{64}$/);
    const audit = await db.select().from(auditLog).where(and(eq(auditLog.siteId, siteId), eq(auditLog.entityId, String(record!.id))));
    expect(audit).toMatchObject([{ action: "reading_import.create", entityType: "reading_import", userId: owner.userId }]);

    // The same file again: nothing new, the stored minutes unchanged.
    const again = await json(await send(importRoute.POST, { sensorId, file }));
    expect(again.import).toMatchObject({ rowsRead: 180, minutesAdded: 0, minutesAlreadyThere: 90 });
    expect(await minutesOf(sensorId)).toEqual(stored);
    const previewAgain = await json(await send(previewRoute.POST, { sensorId, file }));
    expect(previewAgain).toMatchObject({ newMinutes: 0, minutesAlreadyThere: 90 });
  });

  it("leaves a minute the sensor heard live as it was", async () => {
    const sensorId = await freshSensor();
    const start = Date.UTC(2026, 0, 11, 8);
    await db.insert(readingMinutes).values({ sensorId, minute: new Date(start + MIN), samples: 6, tempMinC: 3, tempMaxC: 4, tempMeanC: 3.5, rhMean: 90 });
    const body = await json(await send(importRoute.POST, { sensorId, file: csv(start, 3) }));
    expect(body.import).toMatchObject({ minutesAdded: 2, minutesAlreadyThere: 1 });
    const stored = await minutesOf(sensorId);
    expect(stored.map((m) => [m.minute.getTime() - start, m.samples, m.tempMeanC])).toEqual([
      [0, 1, 5],
      [MIN, 6, 3.5],
      [2 * MIN, 1, 5.2],
    ]);
  });

  it("reads a byte-order mark and Windows line ends", async () => {
    const sensorId = await freshSensor();
    const text = csv(Date.UTC(2026, 0, 12, 8), 10, { eol: "\r\n" });
    const file = new Uint8Array([0xef, 0xbb, 0xbf, ...new TextEncoder().encode(text)]);
    const response = await send(importRoute.POST, { sensorId, file });
    expect(response.status).toBe(201);
    expect((await json(response)).import).toMatchObject({ rowsRead: 10, minutesAdded: 10 });
    expect((await minutesOf(sensorId))[0]).toMatchObject({ tempMeanC: 5, rhMean: 60 });
  });

  it("reads a file in °F with decimal commas, separated by semicolons or quoted with commas", async () => {
    const semi = await freshSensor();
    // 32 °F = 0 °C, 50 °F = 10 °C, 68 °F = 20 °C; 41,9 °F = 5.5 °C (NIST SP 811, B.9: t/°C = (t/°F − 32)/1.8).
    const semiFile = "Zeit;Temperatur °F;Feuchte %\r\n10.01.2026 09:00:00;32,0;55,5\r\n10.01.2026 09:01:00;50;60\r\n10.01.2026 09:02:00;68,0;65\r\n10.01.2026 09:03:00;41,9;70\r\n";
    const opts = { timeColumn: "Zeit", temperatureColumn: "Temperatur °F", humidityColumn: "Feuchte %", dateFormat: "dmy_dot", unit: "f", decimal: "," } as const;
    const response = await send(importRoute.POST, { sensorId: semi, file: semiFile, opts });
    expect(response.status).toBe(201);
    expect((await minutesOf(semi)).map((m) => [m.tempMeanC, m.rhMean])).toEqual([
      [0, 55.5],
      [10, 60],
      [20, 65],
      [5.5, 70],
    ]);

    const quoted = await freshSensor();
    const quotedFile = 'Zeit,Temperatur °F,Feuchte %\n10.01.2026 09:00:00,"32,0","55,5"\n10.01.2026 09:01:00,"212,0","60"\n';
    const refused = await send(importRoute.POST, { sensorId: quoted, file: quotedFile, opts });
    expect(refused.status).toBe(400);
    expect((await json(refused)).rows).toEqual([{ line: 3, message: "temperature 212 °F (100 °C) is outside -50 to 70 °C" }]);
    const unquoted = await json(await send(previewRoute.POST, { sensorId: quoted, file: "Zeit,Temperatur °F,Feuchte %\n10.01.2026 09:00:00,32,0,55,5\n", opts }));
    expect((unquoted.problems as { message: string }[])[0]!.message).toContain("put each number in quotes or separate the columns with semicolons");
    expect(await minutesOf(quoted)).toEqual([]);
  });
});

describe("refused files write nothing", () => {
  it("names each bad row by its line in the preview, and the import refuses the whole file", async () => {
    const sensorId = await freshSensor();
    const file = [
      "Time,Temperature,Humidity",
      "2026-01-13 08:00,10,60",
      "13/01/2026 08:01,10,60",
      "2026-01-13 08:02,ten,60",
      "2026-01-13 08:03,10,160",
      "2026-01-13 08:00,10,60",
      "2099-01-01 00:00,10,60",
      "2026-03-29 01:30,10,60",
      "2026-01-13 08:04,10,60",
    ].join("\n");
    const preview = await json(await send(previewRoute.POST, { sensorId, file }));
    expect(preview).toMatchObject({ rows: 8, good: 2, bad: 6 });
    expect(preview.problems).toEqual([
      { line: 3, message: 'time "13/01/2026 08:01" is not in the format YYYY-MM-DD HH:mm[:ss]' },
      { line: 4, message: 'temperature "ten" is not a number' },
      { line: 5, message: "humidity 160 % is outside 0 to 100 %" },
      { line: 6, message: "the same time as line 2" },
      { line: 7, message: 'time "2099-01-01 00:00" is in the future' },
      { line: 8, message: 'time "2026-03-29 01:30" does not exist in Europe/London: the clocks went forward from 01:00 to 02:00 on 29 March 2026' },
    ]);
    const response = await send(importRoute.POST, { sensorId, file });
    expect(response.status).toBe(400);
    const body = await json(response);
    expect(body.error).toMatchObject({ code: "bad_input", message: "6 of 8 rows need fixing, so nothing was imported. Correct or remove them in the file and import it again." });
    expect(body.rows).toEqual(preview.problems);
    expect(await minutesOf(sensorId)).toEqual([]);
    expect(await importsOf(sensorId)).toEqual([]);
  });

  it("refuses a file that is not CSV, an empty file and a mapping that does not fit, with a sentence", async () => {
    const sensorId = await freshSensor();
    const png = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52]);
    const cases: [string | Uint8Array, RegExp, Partial<ReadingImportOptions>?][] = [
      [png, /not a CSV file: it holds bytes that text never does/],
      ["Dear grower,\nthe readings are attached.\n".replace(",", ""), /no commas, semicolons or tabs/],
      ["", /^The file is empty\.$/],
      ["2026-01-13 08:00,10,60\n2026-01-13 08:01,10,60\n", /should name the columns/],
      ["Time,Temperature,Humidity\n", /header but no readings/],
      ["Time,Temp\n2026-01-13 08:00,10\n", /no column called "Temperature" for the temperature/],
    ];
    for (const [file, message, opts] of cases) {
      for (const handler of [previewRoute.POST, importRoute.POST]) {
        const response = await send(handler, { sensorId, file, opts });
        expect(response.status).toBe(400);
        expect((await json(response)).error!.message).toMatch(message);
      }
    }
    expect(await minutesOf(sensorId)).toEqual([]);
    expect(await importsOf(sensorId)).toEqual([]);
  });

  it("refuses too many rows and too many bytes (413), before reading them", async () => {
    const sensorId = await freshSensor();
    const rows = csv(Date.UTC(2026, 0, 1), 200_001);
    const tooMany = await send(importRoute.POST, { sensorId, file: rows });
    expect(tooMany.status).toBe(413);
    expect((await json(tooMany)).error!.message).toBe("The file holds 200,001 lines of readings; import at most 200,000 at a time (split it by date).");

    const big = new Uint8Array(20 * 1024 * 1024 + 1).fill(0x31);
    big.set(new TextEncoder().encode("Time,Temperature\n"));
    const tooBig = await send(importRoute.POST, { sensorId, file: big });
    expect(tooBig.status).toBe(413);
    expect((await json(tooBig)).error!.message).toBe("The file is larger than 20 MB; import at most 20 MB at a time (split it by date).");
    expect(await minutesOf(sensorId)).toEqual([]);
    expect(await importsOf(sensorId)).toEqual([]);
  });

  it("answers a bad option or another site's sensor before reading the file", async () => {
    const sensorId = await freshSensor();
    const badZone = await send(previewRoute.POST, { sensorId, file: "x", opts: { timeZone: "Mars/Olympus" } });
    expect(badZone.status).toBe(400);
    expect((await json(badZone)).error!.fields).toMatchObject({ timeZone: expect.stringContaining("Not a time zone") });
    const elsewhere = await send(importRoute.POST, { sensorId: demoId("sensor:glass"), file: csv(Date.UTC(2026, 0, 1), 2) });
    expect(elsewhere.status).toBe(404);
  });
});

describe("progress for a large file", () => {
  it("streams the rows read and the minutes written for 100,000 rows, ending with the result", async () => {
    const sensorId = await freshSensor("outside");
    const file = csv(Date.UTC(2026, 5, 1), 100_000);
    const started = performance.now();
    const response = await send(importRoute.POST, { sensorId, file, accept: "application/x-ndjson" });
    expect(response.headers.get("content-type")).toContain("application/x-ndjson");
    const lines = (await response.text()).trim().split("\n").map((l) => JSON.parse(l) as { type: string; stage?: string; done?: number; total?: number; import?: unknown });
    const seconds = (performance.now() - started) / 1000;
    console.log(`100,000 rows imported with progress in ${seconds.toFixed(1)} s`);
    const reading = lines.filter((l) => l.stage === "reading");
    const writing = lines.filter((l) => l.stage === "writing");
    expect(reading.length).toBeGreaterThanOrEqual(2);
    expect(writing.length).toBeGreaterThanOrEqual(2);
    expect(reading.at(-1)).toMatchObject({ done: 100_000, total: 100_000 });
    expect(writing.at(-1)).toMatchObject({ done: 100_000, total: 100_000 });
    expect(lines.at(-1)).toMatchObject({ type: "result", status: 201, import: { rowsRead: 100_000, minutesAdded: 100_000 } });
    const [n] = await db.select({ n: count() }).from(readingMinutes).where(eq(readingMinutes.sensorId, sensorId));
    expect(n!.n).toBe(100_000);
    expect(seconds).toBeLessThan(60);
  }, 120_000);

  it("ends the stream with the refusal when a row is bad", async () => {
    const sensorId = await freshSensor();
    const response = await send(importRoute.POST, { sensorId, file: "Time,Temperature,Humidity\n2026-01-13 08:00,hot,60\n", accept: "application/x-ndjson" });
    const last = JSON.parse((await response.text()).trim().split("\n").at(-1)!) as Json;
    expect(last).toMatchObject({ type: "error", status: 400, error: { code: "bad_input" }, rows: [{ line: 2, message: 'temperature "hot" is not a number' }] });
    expect(await minutesOf(sensorId)).toEqual([]);
  });
});

describe("imported readings in the charts and the degree-days", () => {
  it("the house chart draws imported minutes like live ones, and the degree-days count imported days", async () => {
    // The last three hours, every minute, for the house's inside sensor.
    const now = Date.now();
    const from = Math.floor((now - 3 * HOUR) / (5 * MIN)) * 5 * MIN; // on the 24-hour chart's 5-minute buckets
    const london = (ms: number) => new Date(ms).toLocaleString("sv-SE", { timeZone: "Europe/London" }).slice(0, 16);
    const recent = ["Time,Temperature,Humidity", ...Array.from({ length: 150 }, (_, i) => `${london(from + i * MIN)},12.5,70`)].join("\n");
    expect((await send(importRoute.POST, { sensorId: insideId, file: recent })).status).toBe(201);
    const chart = await getHouseChart({ siteId, houseId, range: "24h", now: new Date(now) });
    expect(chart.sensor?.id).toBe(insideId);
    const drawn = chart.series.tempC.filter((v): v is number => v !== null);
    expect(drawn.length).toBe(30);
    expect(new Set(drawn)).toEqual(new Set([12.5]));

    // Two whole local days outside (Europe/London in November = UTC): 0 °C to 10 °C.
    const dayStart = Date.UTC(2026, 10, 1);
    const outside = csv(dayStart, 2 * 1440, { line: (t, i) => `${t},${(i % 1440) < 720 ? 0 : 10},80` });
    expect((await send(importRoute.POST, { sensorId: outsideId, file: outside })).status).toBe(201);
    const report = await getDegreeDayReport({ siteId, fromDay: "2026-11-01", toDay: "2026-11-03" });
    const reported = report.houses.find((h) => h.id === houseId)!;
    expect(reported.outsideSensor).toMatchObject({ id: outsideId, onThisHouse: true });
    const days = reported.days;
    // The days' lowest, highest and mean come from the imported minutes; the third day has none (missing, not 0).
    expect(days.map((d) => d.outside && { min: d.outside.minC, max: d.outside.maxC, mean: d.outside.meanC })).toEqual([
      { min: 0, max: 10, mean: 5 },
      { min: 0, max: 10, mean: 5 },
      null,
    ]);
    expect(days[0]!.degreeDays).not.toBeNull();
    expect(days[2]!.degreeDays).toBeNull();
    const [n] = await db
      .select({ n: count() })
      .from(readingMinutes)
      .where(and(eq(readingMinutes.sensorId, outsideId), gte(readingMinutes.minute, new Date(dayStart)), lt(readingMinutes.minute, new Date(dayStart + 2 * 86_400_000))));
    expect(n!.n).toBe(2880);
  });
});

describe("who may import", () => {
  it("an owner or grower imports; a helper and a viewer are refused (403) and nothing is written", async () => {
    await seedDemo(db);
    const sensorId = randomUUID();
    probes.push(sensorId);
    await db.insert(sensors).values({ id: sensorId, siteId: DEMO_SITE.id, houseId: demoId("house:glass"), deviceId: `imp-${sensorId.slice(0, 6)}`, name: "Import probe" });
    const file = csv(Date.UTC(2026, 0, 20, 8), 5);
    const roles: Record<string, number> = { helper: 403, viewer: 403, grower: 201 };
    for (const [role, status] of Object.entries(roles)) {
      const member = DEMO_MEMBERS.find((m) => m.role === role)!;
      const cookie = await signIn(member.email, member.password);
      const previewed = await send(previewRoute.POST, { sensorId, file, cookie, site: DEMO_SITE.id });
      expect(previewed.status).toBe(status === 201 ? 200 : 403);
      const response = await send(importRoute.POST, { sensorId, file, cookie, site: DEMO_SITE.id });
      expect(response.status, role).toBe(status);
      expect(await minutesOf(sensorId)).toHaveLength(status === 201 ? 5 : 0);
    }
  });
});
