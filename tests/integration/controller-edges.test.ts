// A window that a reload brings in is switched at its edge by the edge timer, not
// at the next backstop tick (here an hour away).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { asc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { switchEvents } from "@/db/schema";
import { createController, type Controller } from "@/controller/controller";
import { startPlugDevice, type PlugDevice } from "@/fakes/plug-device";
import { addWindowOpeningAt, createControlSite, eventually, testControllerOptions, type ControlSite } from "../support/control-site";

let site: ControlSite;
let controller: Controller;
let light: PlugDevice;

beforeAll(async () => {
  site = await createControlSite(getDb());
  controller = await createController(
    testControllerOptions(site, { tickMs: 3_600_000, startupGraceMs: 0, configReloadMs: 3_600_000 }),
  );
  light = await startPlugDevice({ url: controller.mqttUrl, site: site.slug, device: "light-1", password: site.secret("plug", "light-1"), ratedW: 100, tickMs: 100, reportEveryMs: 0 });
});

afterAll(async () => {
  await light?.close();
  await controller?.close();
});

describe("schedule edges", () => {
  it("switches at the opening of a window added by a reload", async () => {
    // Whole seconds: a window starts on a second. Europe/London local time, as the site keeps.
    const opensMs = Math.ceil((Date.now() + 1500) / 1000) * 1000;
    await addWindowOpeningAt(getDb(), site.lightId, opensMs);
    await controller.reload();
    expect(light.on).toBe(false);
    await eventually(() => light.on, 4000, "light on at the window's opening");
    await controller.flush();
    // (The plug's first report, off, is logged before it as an observed state.)
    const event = (await getDb().select().from(switchEvents).where(eq(switchEvents.plugId, site.lightId)).orderBy(asc(switchEvents.id))).find((e) => e.toOn);
    expect(event).toMatchObject({ toOn: true, cause: "schedule" });
    expect(event!.at.getTime()).toBeGreaterThanOrEqual(opensMs);
    expect(event!.at.getTime() - opensMs).toBeLessThan(250);
  });
});
