import { describe, expect, it } from "vitest";
import { GET } from "@/app/api/health/route";

describe("/api/health", () => {
  it("reports the database as up, with the migrations applied", async () => {
    const response = await GET();
    expect(response.status).toBe(200);
    const body = (await response.json()) as { status: string; database: { state: string; migrationsApplied: number } };
    expect(body.status).toBe("ok");
    expect(body.database.state).toBe("up");
    expect(body.database.migrationsApplied).toBeGreaterThan(0);
  });
});
