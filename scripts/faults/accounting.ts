// Switches lost and doubled, and the gap in control, from two records kept apart: what
// each plug did (its own journal, fakes/journal.ts) and what the controller logged
// (switch_events). Definitions, over a scenario's stretch [from, to]:
//
// - lost: a switch a plug made on a command (its state changed) whose command id is not
//   in the log and that no later observed row (resync, plug_fallback: the controller
//   found the plug so) records — those are counted apart, as "logged as observed"; or a kept log row (not withdrawn) made on a command — every cause but
//   the observed ones, plug_fallback and resync — whose command the plug never obeyed
//   and that no later observed row of the plug superseded.
// - doubled: a command id in the log more than once; or two kept rows of one plug in a
//   row taking it to the same state (the log recorded one change twice); or a plug
//   obeying two different command ids that each changed its state the same way
//   within one switch (on, on) with nothing between — one decision applied twice.
// - out of order: two kept rows of one plug whose log order (id) is not their time order.
// - control gap: for each moment the wanted state of a plug changed (a window opening,
//   a reading over the limit, a plug coming back), the time until its journal shows it
//   in that state; 0 when it already was. The figure is the longest, ack latency included.
import { readPlugJournal, type PlugJournalEntry } from "../../fakes/journal";

const OBSERVED = new Set(["plug_fallback", "resync"]);

export type LogRow = { id: number; device: string; commandId: string; fromOn: boolean | null; toOn: boolean; cause: string; atMs: number; ackAtMs: number | null; withdrawn: boolean };

export type SwitchAccount = {
  applied: number;
  logged: number;
  lost: number;
  /** Switches whose command's row is missing but that the log has as observed (resync, plug_fallback). */
  loggedAsObserved: number;
  doubled: number;
  outOfOrder: number;
  /** One line per switch lost, doubled or out of order. */
  findings: string[];
};

export function accountSwitches(journal: PlugJournalEntry[], log: LogRow[], fromMs: number, toMs: number, logAll: LogRow[] = log): SwitchAccount {
  const findings: string[] = [];
  const within = (ms: number) => ms >= fromMs && ms <= toMs;
  const loggedIds = new Map<string, number>();
  for (const row of logAll) loggedIds.set(row.commandId, (loggedIds.get(row.commandId) ?? 0) + 1);
  const obeyed = new Set(journal.filter((e) => e.what === "command" && e.id).map((e) => e.id!));

  const applied = journal.filter((e) => e.what === "command" && e.changed && within(e.atMs));
  let lost = 0;
  let loggedAsObserved = 0;
  for (const e of applied) {
    // The row of the command is missing, but the controller found the plug so later and
    // logged the change as observed: the change is in the log, its cause is not.
    const observedLater = logAll.find((r) => r.device === e.device && r.atMs >= e.atMs && OBSERVED.has(r.cause) && r.toOn === e.on && !r.withdrawn);
    if (!loggedIds.has(e.id!) && observedLater) {
      loggedAsObserved++;
      findings.push(`logged as ${observedLater.cause}: ${e.device} switched ${e.on ? "on" : "off"} at ${iso(e.atMs)} on command ${e.id}, whose own row is missing`);
    } else if (!loggedIds.has(e.id!)) {
      lost++;
      findings.push(`lost: ${e.device} switched ${e.on ? "on" : "off"} at ${iso(e.atMs)} on command ${e.id}, which the log lacks`);
    }
  }
  const kept = log.filter((r) => !r.withdrawn && within(r.atMs));
  for (const r of kept) {
    if (OBSERVED.has(r.cause) || obeyed.has(r.commandId)) continue;
    // Superseded: a later row records what the plug was actually found doing.
    if (kept.some((later) => later.device === r.device && later.id > r.id && OBSERVED.has(later.cause))) continue;
    lost++;
    findings.push(`lost: the log has ${r.device} ${r.toOn ? "on" : "off"} at ${iso(r.atMs)} (${r.cause}, ${r.commandId}), a command the plug never obeyed`);
  }

  let doubled = 0;
  for (const [id, count] of loggedIds) {
    if (count > 1) {
      doubled += count - 1;
      findings.push(`doubled: command ${id} is in the log ${count} times`);
    }
  }
  let outOfOrder = 0;
  const byDevice = groupBy(kept, (r) => r.device);
  for (const [device, rows] of byDevice) {
    for (let i = 1; i < rows.length; i++) {
      const [a, b] = [rows[i - 1]!, rows[i]!];
      if (a.toOn === b.toOn) {
        doubled++;
        findings.push(`doubled: the log takes ${device} ${b.toOn ? "on" : "off"} twice in a row (${iso(a.atMs)}, ${iso(b.atMs)})`);
      }
      if (b.atMs < a.atMs) {
        outOfOrder++;
        findings.push(`out of order: ${device}'s row ${b.id} (${iso(b.atMs)}) was written after row ${a.id} (${iso(a.atMs)})`);
      }
    }
  }
  for (const [device, entries] of groupBy(journal.filter((e) => e.what !== "start" && within(e.atMs)), (e) => e.device)) {
    let previous: PlugJournalEntry | undefined;
    for (const e of entries) {
      if (!e.changed) continue;
      if (previous && previous.on === e.on && previous.what === "command" && e.what === "command") {
        doubled++;
        findings.push(`doubled: ${device} obeyed two switches ${e.on ? "on" : "off"} in a row (${previous.id}, ${e.id})`);
      }
      previous = e;
    }
  }
  return { applied: applied.length, logged: kept.length, lost, loggedAsObserved, doubled, outOfOrder, findings };
}

/** The plug's state at `ms` by its own journal (undefined before its first entry). */
export function stateAt(journal: PlugJournalEntry[], device: string, ms: number): boolean | undefined {
  let on: boolean | undefined;
  for (const e of journal) if (e.device === device && e.atMs <= ms) on = e.on;
  return on;
}

/** Ms from `fromMs` until the plug was in `wantOn` (0 if it already was); null if it never got there. */
export function timeToReach(journal: PlugJournalEntry[], device: string, wantOn: boolean, fromMs: number): number | null {
  if (stateAt(journal, device, fromMs) === wantOn) return 0;
  const reached = journal.find((e) => e.device === device && e.atMs > fromMs && e.on === wantOn);
  return reached ? reached.atMs - fromMs : null;
}

export function journalOf(file: string) {
  return readPlugJournal(file).sort((a, b) => a.atMs - b.atMs);
}

function groupBy<T>(items: T[], key: (item: T) => string) {
  const groups = new Map<string, T[]>();
  for (const item of items) groups.set(key(item), [...(groups.get(key(item)) ?? []), item]);
  return groups;
}

function iso(ms: number) {
  return new Date(ms).toISOString().slice(11, 23);
}
