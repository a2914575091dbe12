// A simulated plug's own record of what it did, one JSON line per entry, appended to a
// file the fault suite reads back (scripts/faults/accounting.ts). It is written by the
// device, not the controller, so it is a record independent of the switch log.
import { appendFileSync, existsSync, readFileSync } from "node:fs";
import type { PlugJournalEntry } from "./plug-device";

export type { PlugJournalEntry };

/** Appends synchronously: a process killed with SIGKILL keeps every line it wrote. */
export function plugJournalWriter(file: string) {
  return (entry: PlugJournalEntry) => appendFileSync(file, JSON.stringify(entry) + "\n");
}

/** Every entry in the file (none when it does not exist yet); a torn last line is skipped. */
export function readPlugJournal(file: string): PlugJournalEntry[] {
  if (!existsSync(file)) return [];
  const entries: PlugJournalEntry[] = [];
  for (const line of readFileSync(file, "utf8").split("\n")) {
    if (!line.trim()) continue;
    try {
      entries.push(JSON.parse(line) as PlugJournalEntry);
    } catch {
      /* a line cut short by a kill */
    }
  }
  return entries;
}
