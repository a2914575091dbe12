// Schedule resolution must not depend on the process's TZ. This file is also a plain
// script: with SCHEDULE_TZ_PROBE=1, `npx tsx tests/unit/schedule-tz.test.ts` prints the
// full timeline of a year of fixed schedules in several zones (every occurrence, every
// wall-clock conversion around the DST changes, the RFC 5545 examples) as JSON. Under
// vitest, the test runs that script under TZ=UTC, America/New_York and Pacific/Auckland
// and checks that every run prints what this process computes.
import { execFile } from "node:child_process";
import { fileURLToPath } from "node:url";
import { promisify } from "node:util";
import {
  HORIZON_MS,
  type Schedule,
  type ScheduleWindow,
  compileSchedule,
  expandRecurrence,
  nextChange,
  toInstant,
  toLocal,
} from "@/lib/schedule";

const ZONES = ["Europe/London", "Australia/Sydney", "America/New_York", "Pacific/Auckland", "Asia/Kathmandu", "UTC"];
const YEAR = { from: Date.parse("2026-01-01T00:00:00Z"), until: Date.parse("2027-01-01T00:00:00Z") };

const w = (id: string, recurrence: string, startsAt: string, durationMin: number): ScheduleWindow => ({
  id,
  recurrence,
  startsAt,
  durationMin,
  mode: "on",
  lowC: null,
  highC: null,
});

const SCHEDULES: Schedule[] = [
  {
    id: "night",
    validFrom: null,
    validUntil: null,
    skipDays: ["2026-03-29", "2026-12-25"],
    windows: [w("heat", "FREQ=DAILY", "22:00:00", 480), w("early", "FREQ=DAILY", "02:30:00", 45)],
  },
  {
    id: "season",
    validFrom: "2026-03-15",
    validUntil: "2026-10-31",
    skipDays: [],
    windows: [
      w("lights", "FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR,SA,SU", "06:00:00", 840),
      w("boost", "FREQ=WEEKLY;BYDAY=SU", "01:30:00", 90),
      w("week", "FREQ=WEEKLY;WKST=SU;BYDAY=SA", "00:00:00", 7 * 1440),
    ],
  },
];

function probe() {
  const timelines = ZONES.map((zone) => {
    const segments: string[] = [];
    for (let from = YEAR.from; from < YEAR.until; from += HORIZON_MS) {
      const c = compileSchedule(SCHEDULES, zone, from);
      c.occurrences.forEach((o, i) => segments.push(`${o.window.id} ${o.opensMs}-${o.closesMs} [${c.starts[i]},${c.ends[i]})`));
    }
    const changes = [];
    for (let at = YEAR.from; at < YEAR.until; at += 7 * 86_400_000 + 3_600_000) {
      changes.push(nextChange(SCHEDULES, zone, new Date(at))?.getTime() ?? null);
    }
    const wallClock = [];
    for (const day of ["2026-03-29", "2026-04-05", "2026-10-04", "2026-10-25", "2026-03-08", "2026-11-01"]) {
      for (let h = 0; h < 24; h++) {
        const local = `${day}T${String(h).padStart(2, "0")}:30:00`;
        const instant = toInstant(local, zone);
        wallClock.push([instant.getTime(), toLocal(instant, zone)]);
      }
    }
    return { zone, segments: [...new Set(segments)], changes, wallClock };
  });
  const rfc = [
    expandRecurrence("FREQ=WEEKLY;COUNT=10;WKST=SU;BYDAY=TU,TH", "1997-09-02T09:00:00"),
    expandRecurrence("FREQ=WEEKLY;INTERVAL=2;COUNT=8;WKST=SU;BYDAY=TU,TH", "1997-09-02T09:00:00"),
    expandRecurrence("FREQ=WEEKLY;COUNT=10", "1997-09-02T09:00:00").map((t) => toInstant(t, "America/New_York").getTime()),
  ];
  return { timelines, rfc };
}

if (process.env.SCHEDULE_TZ_PROBE) {
  const processZone = Intl.DateTimeFormat().resolvedOptions().timeZone;
  process.stdout.write(JSON.stringify({ processZone, result: probe() }));
} else {
  const { describe, expect, it } = await import("vitest");
  const run = promisify(execFile);
  const file = fileURLToPath(import.meta.url);

  describe("independence from the process's TZ", () => {
    it("gives the same timeline under TZ=UTC, America/New_York and Pacific/Auckland", { timeout: 30_000 }, async () => {
      const here = probe();
      expect(here.timelines.every((t) => t.segments.length > 300)).toBe(true);
      const outputs = await Promise.all(
        ["UTC", "America/New_York", "Pacific/Auckland"].map(async (tz) => {
          const env = { ...process.env, TZ: tz, SCHEDULE_TZ_PROBE: "1" };
          const { stdout } = await run(process.execPath, ["--import", "tsx", file], { env, maxBuffer: 64 << 20 });
          return { tz, ...JSON.parse(stdout) };
        }),
      );
      for (const { tz, processZone, result } of outputs) {
        expect(processZone).toBe(tz);
        expect({ tz, result }).toEqual({ tz, result: here });
      }
    });
  });
}
