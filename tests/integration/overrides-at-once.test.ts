// Many presses on one plug at the same moment: each is answered 201 (or a 409 with a
// sentence when the database kept them colliding), and exactly one override is left in
// force, the one that started last, as the controller and the pages read it.
import { beforeAll, describe, expect, it } from "vitest";
import { and, eq, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { memberships, overrides } from "@/db/schema";
import * as overridesRoute from "@/app/api/sites/[siteId]/plugs/[plugId]/overrides/route";
import { createControlSite, type ControlSite } from "../support/control-site";
import { call, signUp, type Account } from "../support/http";

let site: ControlSite;
let grower: Account;

beforeAll(async () => {
  site = await createControlSite(getDb());
  grower = await signUp({ name: "Test grower" });
  await getDb().insert(memberships).values({ siteId: site.siteId, userId: grower.userId, role: "grower" });
});

describe("override presses at once", () => {
  it("leave one override in force, the latest started, and never a 5xx", async () => {
    const presses = await Promise.all(
      Array.from({ length: 20 }, (_, i) =>
        call(overridesRoute.POST, {
          method: "POST",
          path: "/x",
          params: { siteId: site.siteId, plugId: site.heaterId },
          // "Until the schedule changes" reads the schedule first, so presses reach the plug's lock in another order than they began.
          body: { on: i % 2 === 0, duration: i % 3 === 0 ? "next_change" : "1h", reason: `Press ${i}` },
          cookie: grower.cookie,
        }).then(async (r) => ({ status: r.status, json: (await r.json()) as { error?: { message: string } } })),
      ),
    );
    for (const p of presses) {
      expect([201, 409]).toContain(p.status);
      if (p.status === 409) expect(p.json.error?.message).toMatch(/try again/i);
    }
    expect(presses.filter((p) => p.status === 201).length).toBeGreaterThan(0);

    const open = await getDb()
      .select()
      .from(overrides)
      .where(and(eq(overrides.plugId, site.heaterId), isNull(overrides.cancelledAt)));
    expect(open).toHaveLength(1);
    const all = await getDb().select().from(overrides).where(eq(overrides.plugId, site.heaterId));
    const latestStart = Math.max(...all.map((o) => o.startsAt.getTime()));
    expect(open[0]!.startsAt.getTime()).toBe(latestStart);
  });
});
