// The report's CSV and PDF open and hold the same totals as the page's report; who
// may take them; bad ranges are refused with what is wrong.
import { execFileSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { randomUUID } from "node:crypto";
import { parse } from "csv-parse/sync";
import { DateTime } from "luxon";
import { beforeAll, describe, expect, it } from "vitest";
import * as energyRoute from "@/app/api/sites/[siteId]/reports/energy/route";
import * as csvRoute from "@/app/api/sites/[siteId]/reports/energy/csv/route";
import * as pdfRoute from "@/app/api/sites/[siteId]/reports/energy/pdf/route";
import { getDb } from "@/db/client";
import { refreshEnergyDays } from "@/db/energy-days";
import { getEnergyReport } from "@/db/queries/energy";
import { houses, memberships, plugs, sites, switchEvents, tariffRates, tariffs } from "@/db/schema";
import type { Role } from "@/lib/permissions";
import { call, signUp, type Account } from "../support/http";

const ZONE = "America/New_York";
const siteId = randomUUID();
const slug = `exports-${siteId.slice(0, 8)}`;
const people = {} as Record<Role, Account>;
const range = "from=2026-11-01&to=2026-11-07";

const get = (handler: unknown, who: Role, query = range) =>
  call(handler, { path: `/api/sites/${siteId}/reports/energy?${query}`, params: { siteId }, cookie: people[who].cookie });

beforeAll(async () => {
  const db = getDb();
  await db.insert(sites).values({ id: siteId, slug, name: "Maple Row Gardens", timeZone: ZONE, currency: "USD" });
  for (const role of ["owner", "grower", "helper", "viewer"] as const) {
    people[role] = await signUp();
    await db.insert(memberships).values({ siteId, userId: people[role].userId, role });
  }
  const houseIds = [randomUUID(), randomUUID()];
  await db.insert(houses).values(
    houseIds.map((id, i) => ({ id, siteId, name: ["North hoop house", "=Seed room"][i]!, kind: "polytunnel" as const, lengthM: 8, widthM: 4, eaveHeightM: 2, ridgeHeightM: 3, glazing: "single_film" as const, highLimitC: 30 })),
  );
  const plugIds = [randomUUID(), randomUUID()];
  await db.insert(plugs).values(
    plugIds.map((id, i) => ({ id, siteId, houseId: houseIds[i]!, deviceId: `heat-${i}`, name: `Heater ${i + 1}`, applianceKind: "heater" as const, applianceWatts: 1500, ratedCurrentA: 15 })),
  );
  const tariffId = randomUUID();
  await db.insert(tariffs).values({ id: tariffId, siteId, name: "Residential flat", kind: "flat", standingChargePerDay: 0.35, taxPercent: 6, validFrom: "2026-01-01" });
  await db.insert(tariffRates).values({ id: randomUUID(), tariffId, label: "All hours", startsAt: "00:00:00", endsAt: "00:00:00", pricePerKwh: 0.17 });
  // Nightly heating, across the end of daylight saving on 1 November (a 25-hour day).
  for (const [i, plugId] of plugIds.entries()) {
    for (let d = 0; d < 7; d++) {
      const night = DateTime.fromISO("2026-10-31T21:00", { zone: ZONE }).plus({ days: d });
      for (const [at, toOn] of [
        [night.plus({ minutes: 15 * i }), true],
        [night.plus({ hours: 7 }), false],
      ] as const) {
        await db.insert(switchEvents).values({ plugId, at: at.toJSDate(), fromOn: !toOn, toOn, cause: "schedule", ratedWatts: toOn ? 1500 : null, commandId: randomUUID() });
      }
    }
    await refreshEnergyDays(db, [{ plugId, fromMs: Date.parse("2026-10-31T00:00:00Z"), toMs: Date.parse("2026-11-09T00:00:00Z") }]);
  }
});

describe("the report's exports", () => {
  it("the CSV holds the report's rows, and its costs add up to the page's total", async () => {
    const page = await getEnergyReport({ siteId, fromDay: "2026-11-01", toDay: "2026-11-07", bucket: "day" });
    const response = await get(csvRoute.GET, "owner");
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toMatch(/^text\/csv/);
    expect(response.headers.get("content-disposition")).toContain(`${slug}-energy-2026-11-01-to-2026-11-07.csv`);
    const rows = parse(await response.text(), { columns: true }) as Record<string, string>[];
    const total = rows.find((r) => r.row === "total")!;
    expect(Number(total.cost_USD)).toBeCloseTo(page.site.total!, 2);
    expect(Number(total.runtime_h)).toBeCloseTo(page.site.onHours, 3);
    const parts = rows.filter((r) => r.row !== "total").reduce((sum, r) => sum + Number(r.cost_USD), 0);
    expect(parts).toBeCloseTo(page.site.total!, 1);
    // A house name that starts like a formula is written as text.
    expect(rows.some((r) => r.house === "'=Seed room")).toBe(true);
    // 1 November, the 25-hour day (IANA rules for America/New_York): the heater on from
    // 21:00 the evening before runs 7 real hours, to 03:00 by the clock, so 00:00–03:00
    // holds 4 hours (01:00–02:00 happens twice); then 21:00–24:00 again: 7 h in all.
    const first = rows.find((r) => r.row === "plug" && r.period_from === "2026-11-01" && r.plug === "Heater 1")!;
    expect(Number(first.runtime_h)).toBe(4 + 3);
  });

  it("the PDF opens, and reads back with the site, the period, the tariff and the same totals", async () => {
    const page = await getEnergyReport({ siteId, fromDay: "2026-11-01", toDay: "2026-11-07", bucket: "day" });
    const response = await get(pdfRoute.GET, "viewer");
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toBe("application/pdf");
    const bytes = Buffer.from(await response.arrayBuffer());
    expect(bytes.subarray(0, 5).toString()).toBe("%PDF-");
    const file = path.join(mkdtempSync(path.join(tmpdir(), "cloche-pdf-")), "report.pdf");
    writeFileSync(file, bytes);
    // pdftotext from Debian's poppler-utils.
    const text = execFileSync("pdftotext", ["-layout", file, "-"], { encoding: "utf8" });
    const money = (v: number) => new Intl.NumberFormat("en-GB", { style: "currency", currency: "USD", minimumFractionDigits: 2, maximumFractionDigits: 2 }).format(v);
    expect(text).toContain("Maple Row Gardens");
    expect(text).toContain("1 November 2026 to 7 November 2026");
    expect(text).toContain("Residential flat");
    expect(text).toContain("North hoop house");
    expect(text).toContain(money(page.site.total!));
    expect(text).toContain(money(page.houses.find((h) => h.name === "North hoop house")!.cost!));
  });

  it("the JSON report is the page's report", async () => {
    const response = await get(energyRoute.GET, "helper");
    expect(response.status).toBe(200);
    const body = (await response.json()) as { site: { total: number } };
    const page = await getEnergyReport({ siteId, fromDay: "2026-11-01", toDay: "2026-11-07", bucket: "day" });
    expect(body.site.total).toBeCloseTo(page.site.total!, 9);
  });

  it("lets the owner and the viewer take exports, not the grower or the helper", async () => {
    for (const [who, status] of [
      ["owner", 200],
      ["viewer", 200],
      ["grower", 403],
      ["helper", 403],
    ] as const) {
      expect((await get(csvRoute.GET, who)).status, who).toBe(status);
    }
  });

  it("refuses a range that is back to front, too long or not a date, saying which", async () => {
    for (const [query, message] of [
      ["from=2026-11-07&to=2026-11-01", "From must not be after To"],
      ["from=2025-01-01&to=2026-12-31", "at most 400 days"],
      ["from=2026-02-30&to=2026-03-01", "From is not a date in the calendar"],
      ["from=2026-11-01&to=2026-11-07&by=fortnight", "By must be"],
    ]) {
      const response = await get(energyRoute.GET, "owner", query);
      expect(response.status, query).toBe(400);
      expect(JSON.stringify(await response.json()), query).toContain(message);
    }
  });
});
