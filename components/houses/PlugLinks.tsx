import Link from "next/link";
import type { Role } from "@/lib/domain";
import { can } from "@/lib/permissions";

const link =
  "inline-flex min-h-11 items-center rounded-lg border border-frost-300 bg-white px-3 text-sm font-semibold text-frost-900 hover:bg-frost-100";

/**
 * Where a person may go from a plug: switch it for a while, or its weekly schedule.
 * Not prefetched: a house of plugs would otherwise fetch every plug's pages on a phone.
 */
export function PlugLinks({ slug, plugId, plugName, role }: { slug: string; plugId: string; plugName: string; role: Role }) {
  const base = `/sites/${encodeURIComponent(slug)}/plugs/${encodeURIComponent(plugId)}`;
  const override = can(role, "overrides.create");
  const schedule = can(role, "schedules.manage");
  if (!override && !schedule) return null;
  return (
    <div className="mt-2 flex flex-wrap gap-2">
      {override ? (
        <Link href={`${base}/override`} prefetch={false} className={link}>
          Switch for a while<span className="sr-only">: {plugName}</span>
        </Link>
      ) : null}
      {schedule ? (
        <Link href={`${base}/schedule`} prefetch={false} className={link}>
          Schedule<span className="sr-only"> of {plugName}</span>
        </Link>
      ) : null}
    </div>
  );
}
