import { sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { getControllerStatus } from "@/db/queries/controller-status";

export const dynamic = "force-dynamic";

/**
 * Liveness of the app and the state of its database, for people and monitors. The
 * controller's state is reported beside them but does not change the status code: this
 * says whether the web app can serve, and it can while the controller is away.
 */
export async function GET() {
  const started = performance.now();
  try {
    const [result, controller] = await Promise.race([
      Promise.all([getDb().execute(sql`SELECT COUNT(*) AS applied FROM __drizzle_migrations`), getControllerStatus()]),
      new Promise<never>((_, reject) => setTimeout(() => reject(new Error("timed out after 2 s")), 2000)),
    ]);
    const rows = result[0] as unknown as { applied: number }[];
    return Response.json({
      status: "ok",
      controller: controller.running ? "running" : "not running",
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
