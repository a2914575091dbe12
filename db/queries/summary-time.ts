import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { sites } from "@/db/schema";
import { recordAudit } from "./audit";

/** The site's daily summary time (HH:MM in its zone), or null for none. */
export async function getSummaryTime({ siteId }: { siteId: string }): Promise<string | null> {
  const [row] = await getDb().select({ summaryTime: sites.summaryTime }).from(sites).where(eq(sites.id, siteId));
  return row?.summaryTime ?? null;
}

/** Sets when the daily summary goes out; audited as site.summary. */
export async function saveSummaryTime({ siteId, siteName, userId, summaryTime }: { siteId: string; siteName: string; userId: string; summaryTime: string | null }) {
  await getDb().transaction(async (tx) => {
    const [before] = await tx.select({ summaryTime: sites.summaryTime }).from(sites).where(eq(sites.id, siteId)).for("update");
    await tx.update(sites).set({ summaryTime }).where(eq(sites.id, siteId));
    await recordAudit(tx, {
      siteId,
      userId,
      action: "site.summary",
      entityType: "site",
      entityId: siteId,
      before: { name: siteName, summaryTime: before?.summaryTime ?? null },
      after: { name: siteName, summaryTime },
    });
  });
  return { summaryTime };
}
