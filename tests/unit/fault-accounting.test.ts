// The fault suite's switch account: what counts as a switch lost, doubled or out of
// order, from a plug's own journal and the switch log (scripts/faults/accounting.ts).
import { describe, expect, it } from "vitest";
import { accountSwitches, stateAt, timeToReach, type LogRow } from "../../scripts/faults/accounting";
import type { PlugJournalEntry } from "../../fakes/journal";

const plug = "glass-fan";
const entry = (atMs: number, what: PlugJournalEntry["what"], id: string | null, on: boolean, changed: boolean): PlugJournalEntry => ({ device: plug, what, id, on, changed, atMs });
let nextId = 1;
const row = (atMs: number, commandId: string, toOn: boolean, extra: Partial<LogRow> = {}): LogRow => ({
  id: nextId++,
  device: plug,
  commandId,
  fromOn: !toOn,
  toOn,
  cause: "schedule",
  atMs,
  ackAtMs: atMs + 20,
  withdrawn: false,
  ...extra,
});

describe("accountSwitches", () => {
  it("finds nothing wrong when every switch the plug made is in the log once", () => {
    const journal = [entry(0, "start", null, false, false), entry(1000, "command", "a", true, true), entry(1300, "command", "a", true, false), entry(2000, "command", "b", false, true)];
    const log = [row(990, "a", true), row(1990, "b", false)];
    expect(accountSwitches(journal, log, 0, 5000)).toMatchObject({ applied: 2, logged: 2, lost: 0, doubled: 0, outOfOrder: 0, loggedAsObserved: 0 });
  });

  it("counts a switch the plug made that the log lacks as lost", () => {
    const journal = [entry(1000, "command", "a", true, true)];
    expect(accountSwitches(journal, [], 0, 5000).lost).toBe(1);
  });

  it("counts it apart when the log has the change only as observed (resync)", () => {
    const journal = [entry(1000, "command", "a", true, true)];
    const account = accountSwitches(journal, [row(3000, "r1", true, { cause: "resync" })], 0, 5000);
    expect(account).toMatchObject({ lost: 0, loggedAsObserved: 1 });
  });

  it("counts a logged command the plug never obeyed as lost, unless withdrawn or superseded by an observed row", () => {
    expect(accountSwitches([], [row(1000, "a", true)], 0, 5000).lost).toBe(1);
    expect(accountSwitches([], [row(1000, "a", true, { withdrawn: true })], 0, 5000).lost).toBe(0);
    expect(accountSwitches([], [row(1000, "a", true), row(2000, "f", false, { cause: "plug_fallback" })], 0, 5000).lost).toBe(0);
  });

  it("counts a command id logged twice, and the log taking a plug to one state twice in a row, as doubled", () => {
    const journal = [entry(1000, "command", "a", true, true)];
    expect(accountSwitches(journal, [row(1000, "a", true), row(1001, "a", true)], 0, 5000).doubled).toBeGreaterThanOrEqual(1);
    const twice = [entry(1000, "command", "a", true, true), entry(1500, "command", "b", true, false)];
    expect(accountSwitches(twice, [row(1000, "a", true), row(1500, "b", true)], 0, 5000).doubled).toBe(1);
  });

  it("counts a plug obeying two switches the same way in a row as doubled", () => {
    const journal = [entry(1000, "command", "a", true, true), entry(1200, "command", "b", true, true)];
    expect(accountSwitches(journal, [row(1000, "a", true), row(1200, "b", false)], 0, 5000).doubled).toBe(1);
  });

  it("counts rows written out of their time order", () => {
    const journal = [entry(1000, "command", "a", true, true), entry(900, "command", "b", false, true)];
    expect(accountSwitches(journal, [row(1000, "a", true), row(900, "b", false)], 0, 5000).outOfOrder).toBe(1);
  });

  it("leaves out what happened outside the stretch", () => {
    expect(accountSwitches([entry(9000, "command", "a", true, true)], [], 0, 5000).lost).toBe(0);
  });
});

describe("timeToReach", () => {
  const journal = [entry(0, "start", null, false, false), entry(1500, "command", "a", true, true)];
  it("is the time from the moment until the plug is in the wanted state", () => {
    expect(timeToReach(journal, plug, true, 1000)).toBe(500);
    expect(timeToReach(journal, plug, false, 1000)).toBe(0);
    expect(timeToReach(journal, plug, true, 2000)).toBe(0);
    expect(stateAt(journal, plug, -1)).toBeUndefined();
  });
  it("is null when the plug never got there", () => {
    expect(timeToReach(journal, plug, false, 2000)).toBeNull();
  });
});
