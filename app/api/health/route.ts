import { sql } from "drizzle-orm";
import { getDb } from "@/db/client";

export const dynamic = "force-dynamic";

/** Liveness of the app and the state of its database, for people and monitors. */
export async function GET() {
  const started = performance.now();
  try {
    const result = await Promise.race([
      getDb().execute(sql`SELECT COUNT(*) AS applied FROM __drizzle_migrations`),
      new Promise<never>((_, reject) => setTimeout(() => reject(new Error("timed out after 2 s")), 2000)),
    ]);
    const rows = result[0] as unknown as { applied: number }[];
    return Response.json({
      status: "ok",
      database: {
        state: "up",
        latencyMs: Math.round((performance.now() - started) * 10) / 10,
        migrationsApplied: Number(rows[0]?.applied ?? 0),
      },
    });
  } catch (error) {
    console.error("[health] database check failed", error);
    return Response.json({ status: "degraded", database: { state: "down" } }, { status: 503 });
  }
}
