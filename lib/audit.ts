// How the activity page reads the audit trail: labels for actions, the local days of a
// date filter as instants, and a before/after pair as a short list of changed fields.
import { DateTime } from "luxon";
import { AUDIT_ACTION_LABELS, AUDIT_ENTITY_LABELS, AUDIT_FIELD_LABELS } from "./domain";

/** "house.update" → "Changed a house"; an action without a label still reads: "Plug: calibrate". */
export function describeAuditAction(action: string): string {
  const known = AUDIT_ACTION_LABELS[action];
  if (known) return known;
  const [entity, ...verb] = action.split(".");
  const entityLabel = entity ? AUDIT_ENTITY_LABELS[entity] : undefined;
  return entityLabel && verb.length ? `${entityLabel}: ${verb.join(".").replace(/[_-]/g, " ")}` : action;
}

export function describeAuditEntity(entityType: string): string {
  return AUDIT_ENTITY_LABELS[entityType] ?? entityType;
}

/**
 * The instants a range of local dates covers in the site's zone: from the start of
 * `from` to the start of the day after `to` (exclusive), as luxon moves a midnight that
 * a clock change skips.
 */
export function localDayRange({ from, to }: { from?: string; to?: string }, timeZone: string): { start?: Date; end?: Date } {
  const day = (iso: string) => DateTime.fromISO(iso, { zone: timeZone }).startOf("day");
  return {
    start: from ? day(from).toJSDate() : undefined,
    end: to ? day(to).plus({ days: 1 }).startOf("day").toJSDate() : undefined,
  };
}

/** The keyset of the newest-first list: (at, id) of the last entry shown. */
export type AuditCursor = { at: Date; id: number };

export function encodeAuditCursor({ at, id }: AuditCursor): string {
  return `${at.getTime()}_${id}`;
}

export function decodeAuditCursor(cursor: string): AuditCursor | null {
  const match = /^(\d{1,15})_(\d{1,15})$/.exec(cursor);
  return match ? { at: new Date(Number(match[1])), id: Number(match[2]) } : null;
}

export type FieldChange = { field: string; label: string; before: string | null; after: string | null };

/** Fields kept out of the list: keys and bookkeeping, and secrets' hashes. */
const HIDDEN = new Set(["id", "siteId", "createdAt", "updatedAt", "tokenHash", "secretHash", "passwordHash"]);

const UNIT_SUFFIXES: [RegExp, string][] = [
  [/C$/, " (°C)"],
  [/M$/, " (m)"],
  [/S$/, " (s)"],
  [/A$/, " (A)"],
  [/Percent$/, " (%)"],
];

/** "minOnS" → "Min on (s)"; a field of a nested object is "Parent › child". */
export function fieldLabel(path: string): string {
  const known = AUDIT_FIELD_LABELS[path];
  if (known) return known;
  return path
    .split(".")
    .map((key) => {
      const own = AUDIT_FIELD_LABELS[key];
      if (own) return own;
      let unit = "";
      let base = key;
      for (const [pattern, suffix] of UNIT_SUFFIXES) {
        if (pattern.test(key) && key.length > 2) {
          unit = suffix;
          base = key.replace(pattern, "");
          break;
        }
      }
      const words = base.replace(/([a-z0-9])([A-Z])/g, "$1 $2").replace(/[_-]+/g, " ").toLowerCase().trim();
      return words.charAt(0).toUpperCase() + words.slice(1) + unit;
    })
    .join(" › ");
}

const ISO_INSTANT = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:\d{2})$/;

/** One value as a person reads it; instants in the site's zone. */
export function formatAuditValue(value: unknown, timeZone: string): string | null {
  if (value === null || value === undefined) return null;
  if (typeof value === "boolean") return value ? "yes" : "no";
  if (typeof value === "number") return Number.isInteger(value) ? String(value) : String(Math.round(value * 1000) / 1000);
  if (typeof value === "string") {
    if (ISO_INSTANT.test(value)) {
      const at = DateTime.fromISO(value, { zone: timeZone });
      if (at.isValid) return at.toFormat("d LLL yyyy, HH:mm");
    }
    return value;
  }
  if (Array.isArray(value)) {
    if (value.every((v) => v === null || ["string", "number", "boolean"].includes(typeof v))) {
      const items = value.map((v) => formatAuditValue(v, timeZone) ?? "—");
      // Items that hold commas themselves (a window in words) are set apart by semicolons.
      return items.length ? items.join(items.some((i) => i.includes(",")) ? "; " : ", ") : "none";
    }
    return `${value.length} ${value.length === 1 ? "entry" : "entries"}`;
  }
  return "(details)";
}

/** Nested objects become dotted paths, so each leaf is one line of the list. */
function flatten(value: unknown, prefix = "", out: Map<string, unknown> = new Map()): Map<string, unknown> {
  if (value && typeof value === "object" && !Array.isArray(value)) {
    for (const [key, inner] of Object.entries(value)) {
      if (HIDDEN.has(key)) continue;
      flatten(inner, prefix ? `${prefix}.${key}` : key, out);
    }
  } else if (prefix) {
    out.set(prefix, value);
  }
  return out;
}

/**
 * The fields that differ between before and after. A creation lists what was set
 * (before is null), a removal what there was (after is null). A value that is not an
 * object is shown as the one change "Value".
 */
export function describeAuditChanges(before: unknown, after: unknown, timeZone: string): FieldChange[] {
  const isRecord = (v: unknown) => v !== null && typeof v === "object" && !Array.isArray(v);
  if ((before != null && !isRecord(before)) || (after != null && !isRecord(after))) {
    const b = formatAuditValue(before, timeZone);
    const a = formatAuditValue(after, timeZone);
    return b === a ? [] : [{ field: "value", label: "Value", before: b, after: a }];
  }
  const b = flatten(before);
  const a = flatten(after);
  const fields = [...new Set([...b.keys(), ...a.keys()])];
  const changes: FieldChange[] = [];
  for (const field of fields) {
    // Partial changes list only what was sent: a field missing after an update did not change.
    if (before != null && after != null && !a.has(field)) continue;
    if (JSON.stringify(b.get(field)) === JSON.stringify(a.get(field))) continue;
    changes.push({ field, label: fieldLabel(field), before: formatAuditValue(b.get(field), timeZone), after: formatAuditValue(a.get(field), timeZone) });
  }
  return changes;
}

/** The thing an entry is about, by its name where the entry carries one. */
export function auditSubject(entry: { entityType: string; before: unknown; after: unknown }): string {
  const named = (v: unknown) => (v && typeof v === "object" && "name" in v && typeof v.name === "string" ? v.name : undefined);
  const email = (v: unknown) => (v && typeof v === "object" && "email" in v && typeof v.email === "string" ? v.email : undefined);
  return named(entry.after) ?? named(entry.before) ?? email(entry.after) ?? email(entry.before) ?? describeAuditEntity(entry.entityType);
}
