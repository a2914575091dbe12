import "server-only";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { plugs, sensors } from "@/db/schema";
import { AppError } from "@/lib/errors";

/** A plug or sensor of the site by its record id; 404 when it is not there. */
export async function getDeviceOfSite({ siteId, kind, id }: { siteId: string; kind: "plug" | "sensor"; id: string }) {
  const table = kind === "plug" ? plugs : sensors;
  const [row] = await getDb()
    .select({ id: table.id, deviceId: table.deviceId, name: table.name })
    .from(table)
    .where(and(eq(table.siteId, siteId), eq(table.id, id)))
    .limit(1);
  if (!row) throw new AppError("not_found", `No such ${kind} in this site.`);
  return row;
}
