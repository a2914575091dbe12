import { describe, expect, it } from "vitest";
import { formatInsert, formatUpdate, upsertMany } from "@/db/bulk";
import { plugStates, readings, schedules, switchEvents } from "@/db/schema";

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
    expect(formatInsert(switchEvents, [row], { replace: ["ackAt", "toOn"] })).toMatch(/ ON DUPLICATE KEY UPDATE `ack_at` = VALUES\(`ack_at`\), `to_on` = VALUES\(`to_on`\)$/);
  });

  it("leaves a column with an SQL default that a row does not name to that default", () => {
    const statement = formatInsert(plugStates, [{ plugId: "p1", on: null, updatedAt: new Date(0) }]);
    expect(statement).toBe("INSERT INTO `plug_states` (`plug_id`, `on`, `updated_at`) VALUES ('p1', NULL, '1970-01-01 00:00:00.000')");
    const mixed = formatInsert(plugStates, [{ plugId: "p1", online: true, updatedAt: new Date(0) }, { plugId: "p2", updatedAt: new Date(0) }]);
    expect(mixed).toContain("('p2', DEFAULT, '1970-01-01 00:00:00.000')");
  });

  it("fills in what Drizzle would (ids, timestamps) and refuses a key that is not a column", () => {
    const statement = formatInsert(schedules, [{ plugId: "p1", name: "Winter" }, { plugId: "p2", name: "Spring", createdAt: new Date(0) }]);
    expect(statement).toMatch(/^INSERT INTO `schedules` \(`plug_id`, `name`, `created_at`, `id`, `updated_at`\) VALUES /);
    const stamp = "'\\d{4}-\\d\\d-\\d\\d \\d\\d:\\d\\d:\\d\\d\\.\\d{3}'";
    const uuid = "'[0-9a-f-]{36}'";
    expect(statement).toMatch(new RegExp(`\\('p1', 'Winter', ${stamp}, ${uuid}, ${stamp}\\), \\('p2', 'Spring', '1970-01-01 00:00:00.000', ${uuid}, ${stamp}\\)$`));
    expect(() => formatInsert(readings, [{ sensorId: "s", at: new Date(0), colour: "red" } as never])).toThrow(/no column "colour"/);
  });
});

describe("upsertMany", () => {
  it("writes each set of columns in its own statement, replacing only the columns a row names", async () => {
    const statements: string[] = [];
    const executor = { execute: async (query: { queryChunks?: unknown[] }) => void statements.push(String((query.queryChunks?.[0] as { value: string[] }).value[0])) };
    const at = new Date(0);
    await upsertMany(executor as never, plugStates, [
      { plugId: "p1", online: true, updatedAt: at },
      { plugId: "p2", on: true, presentCause: "schedule", updatedAt: at },
      { plugId: "p3", updatedAt: at, online: false },
    ]);
    expect(statements).toHaveLength(2);
    expect(statements[0]).toMatch(/^INSERT INTO `plug_states` \(`plug_id`, `online`, `updated_at`\) VALUES \('p1', true, .*\), \('p3', false, .*\) ON DUPLICATE KEY UPDATE `online` = VALUES\(`online`\), `updated_at` = VALUES\(`updated_at`\)$/);
    expect(statements[1]).toMatch(/ON DUPLICATE KEY UPDATE `on` = VALUES\(`on`\), `present_cause` = VALUES\(`present_cause`\), `updated_at` = VALUES\(`updated_at`\)$/);
  });
});

describe("formatUpdate", () => {
  it("sets each row's own values in one statement, by key, leaving other rows alone", () => {
    const statement = formatUpdate(plugStates, "plugId", [
      { plugId: "p1", online: true, lastSeenAt: new Date("2026-12-02T10:00:00.500Z") },
      { plugId: "p2", online: false },
    ]);
    expect(statement).toBe(
      "UPDATE `plug_states` SET " +
        "`online` = CASE `plug_id` WHEN 'p1' THEN true WHEN 'p2' THEN false ELSE `online` END, " +
        "`last_seen_at` = CASE `plug_id` WHEN 'p1' THEN '2026-12-02 10:00:00.500' ELSE `last_seen_at` END " +
        "WHERE `plug_id` IN ('p1', 'p2')",
    );
  });

  it("refuses a column the table does not have, and a row with nothing to set", () => {
    expect(() => formatUpdate(plugStates, "plugId", [{ plugId: "p1", colour: "red" } as never])).toThrow(/no column "colour"/);
    expect(() => formatUpdate(plugStates, "plugId", [{ plugId: "p1" }])).toThrow(/no column to set/);
  });
});
