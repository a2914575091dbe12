import { auditSubject, describeAuditAction, describeAuditChanges } from "@/lib/audit";
import { formatMoment } from "@/components/members/api";

export type AuditEntryJson = {
  id: number;
  at: string;
  userId: string | null;
  userName: string | null;
  action: string;
  entityType: string;
  entityId: string;
  before: unknown;
  after: unknown;
};

/** One change: what, to which thing, who and when, and each changed field before → after. */
export function ActivityEntry({ entry, timeZone }: { entry: AuditEntryJson; timeZone: string }) {
  const changes = describeAuditChanges(entry.before, entry.after, timeZone);
  return (
    <li className="py-4">
      <p className="font-semibold text-frost-950">
        {describeAuditAction(entry.action)}
        <span className="font-normal text-frost-700"> · {auditSubject(entry)}</span>
      </p>
      <p className="text-sm text-frost-600">
        {entry.userName ?? "Someone no longer here"} · <time dateTime={entry.at}>{formatMoment(entry.at, timeZone)}</time>
      </p>
      {changes.length ? (
        <ul className="mt-2 flex flex-col gap-1 text-sm">
          {changes.map((change) => (
            <li key={change.field} className="flex flex-wrap gap-x-2">
              <span className="font-medium text-frost-900">{change.label}:</span>
              {change.before !== null ? <del className="text-frost-600 decoration-frost-400">{change.before}</del> : null}
              {change.before !== null && change.after !== null ? <span aria-hidden="true" className="text-frost-500">→</span> : null}
              {change.after !== null ? <ins className="font-medium text-leaf-800 no-underline">{change.after}</ins> : null}
              {change.after === null ? <span className="text-frost-600">(removed)</span> : null}
            </li>
          ))}
        </ul>
      ) : null}
    </li>
  );
}
