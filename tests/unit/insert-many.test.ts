import { describe, expect, it } from "vitest";
import { formatInsert } from "@/db/insert-many";
import { readings, switchEvents, sites } from "@/db/schema";

describe("formatInsert", () => {
  it("writes every row with the columns any row names, in UTC, NULL where a row has none", () => {
    const statement = formatInsert(switchEvents, [
      { plugId: "p1", at: new Date("2026-03-29T00:59:59.123Z"), fromOn: null, toOn: true, cause: "schedule", commandId: "c1" },
      { plugId: "p2", at: new Date("2026-03-29T01:00:00.000Z"), fromOn: true, toOn: false, cause: "override", commandId: "c2", ackAt: new Date("2026-03-29T01:00:00.250Z"), latencyMs: 250 },
    ]);
    expect(statement).toBe(
      "INSERT INTO `switch_events` (`plug_id`, `at`, `from_on`, `to_on`, `cause`, `command_id`, `ack_at`, `latency_ms`) VALUES " +
        "('p1', '2026-03-29 00:59:59.123', NULL, true, 'schedule', 'c1', NULL, NULL), " +
        "('p2', '2026-03-29 01:00:00.000', true, false, 'override', 'c2', '2026-03-29 01:00:00.250', 250)",
    );
  });

  it("escapes text, so a device's words cannot become SQL", () => {
    const statement = formatInsert(readings, [{ sensorId: "x'); DROP TABLE readings; --", at: new Date(0), tempC: 4.5 }]);
    expect(statement).toContain("'x\\'); DROP TABLE readings; --'");
    expect(statement).toContain("'4.5'");
  });

  it("adds the duplicate-key rule asked for", () => {
    const row = { plugId: "p1", at: new Date(0), toOn: true, cause: "schedule" as const, commandId: "c1", ackAt: null };
    expect(formatInsert(switchEvents, [row], { fillIn: ["ackAt"] })).toMatch(/ ON DUPLICATE KEY UPDATE `ack_at` = COALESCE\(VALUES\(`ack_at`\), `ack_at`\)$/);
    expect(formatInsert(switchEvents, [row], { keep: true })).toMatch(/ ON DUPLICATE KEY UPDATE `plug_id` = `plug_id`$/);
  });

  it("fills a missing column from its default function, and refuses a key that is not a column", () => {
    const statement = formatInsert(sites, [{ id: "s1", slug: "a", name: "A", timeZone: "UTC", currency: "GBP" }, { id: "s2", slug: "b", name: "B", timeZone: "UTC", currency: "GBP", createdAt: new Date(0) }]);
    expect(statement).toMatch(/\('s1', 'a', 'A', 'UTC', 'GBP', '\d{4}-\d\d-\d\d \d\d:\d\d:\d\d\.\d{3}'\)/);
    expect(() => formatInsert(readings, [{ sensorId: "s", at: new Date(0), colour: "red" } as never])).toThrow(/no column "colour"/);
  });
});
