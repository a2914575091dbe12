// An override reaches the plug through the real controller and a simulated plug, and
// the plug's own report comes back to a page through the web app's server-sent events.
// Also: what the web app's MQTT principal may subscribe to.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { MqttClient } from "mqtt";
import { getDb } from "@/db/client";
import { memberships } from "@/db/schema";
import { createController, type Controller } from "@/controller/controller";
import type { PlugDevice } from "@/fakes/plug-device";
import { setWakeBroker } from "@/lib/server/wake";
import { closePlugEvents, plugEventsConnected } from "@/lib/server/plug-events";
import * as overridesRoute from "@/app/api/sites/[siteId]/plugs/[plugId]/overrides/route";
import * as eventsRoute from "@/app/api/sites/[siteId]/plugs/[plugId]/events/route";
import { connectWebapp, createControlSite, eventually, startTestHeater, testControllerOptions, type ControlSite } from "../support/control-site";
import { call, signUp, type Account } from "../support/http";
import { sseReader } from "../support/sse";

let site: ControlSite;
let controller: Controller;
let heater: PlugDevice;
let helper: Account;
let webappSecret: string;
let webapp: MqttClient | undefined;

beforeAll(async () => {
  // A quiet sensor and its fail-safe off keep the heater off until someone overrides it.
  site = await createControlSite(getDb(), { staleAfterS: 2, failsafe: "off" });
  helper = await signUp();
  await getDb().insert(memberships).values({ siteId: site.siteId, userId: helper.userId, role: "helper" });
  const options = testControllerOptions(site, { configReloadMs: 3600_000 });
  webappSecret = options.webappSecret;
  controller = await createController(options);
  await setWakeBroker({ url: controller.mqttUrl, secret: options.webappSecret });
  heater = await startTestHeater(site, controller.mqttUrl);
  await eventually(() => heater.on === false, 5000, "heater off");
});

afterAll(async () => {
  await webapp?.endAsync();
  await closePlugEvents();
  await setWakeBroker(null);
  await heater?.close();
  await controller?.close();
});

const plugParams = () => ({ siteId: site.siteId, plugId: site.heaterId });

describe("the plug's events", () => {
  it("deliver the plug's report of an override within a second, and end when the client goes", async () => {
    const abort = new AbortController();
    const response = await (eventsRoute.GET as (r: Request, c: { params: Promise<Record<string, string>> }) => Promise<Response>)(
      new Request(`http://127.0.0.1:3000/api/sites/${site.siteId}/plugs/${site.heaterId}/events`, {
        headers: { cookie: helper.cookie },
        signal: abort.signal,
      }),
      { params: Promise.resolve(plugParams()) },
    );
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toMatch(/^text\/event-stream/);
    const events = sseReader(response.body!);
    const hello = await events.next((e) => e.event === "hello");
    expect(hello.data).toMatchObject({ live: true });
    // The latest report: in the greeting once heard, else replayed (retained) just after it.
    const first = (hello.data as { report: { on: boolean } | null }).report ?? (await events.next((e) => e.event === "report")).data;
    expect(first).toMatchObject({ on: false });
    expect(plugEventsConnected()).toBe(true);

    const started = Date.now();
    const pressed = await call(overridesRoute.POST, { method: "POST", path: "/x", params: plugParams(), body: { on: true, duration: "30m" }, cookie: helper.cookie });
    expect(pressed.status).toBe(201);
    const { override } = (await pressed.json()) as { override: { startsAt: string } };
    const report = await events.next((e) => e.event === "report" && (e.data as { on: boolean }).on === true, 2000);
    expect(Date.now() - started).toBeLessThan(1000);
    expect(heater.on).toBe(true);
    expect((report.data as { receivedAt: number }).receivedAt).toBeGreaterThanOrEqual(Date.parse(override.startsAt));

    abort.abort();
    await eventually(() => events.closed, 2000, "the stream to close");
  });

  it("another site's plug has no stream (404)", async () => {
    const outsider = await signUp();
    const response = await call(eventsRoute.GET, { path: "/x", params: plugParams(), cookie: outsider.cookie });
    expect(response.status).toBe(404);
  });
});

describe("the web app's MQTT rights", () => {
  it("may subscribe to plug reports and presence, and to nothing else", async () => {
    webapp = await connectWebapp(controller.mqttUrl, webappSecret);
    // mqtt.js turns a refused subscription (SUBACK 128) into an error.
    const grant = (filter: string) =>
      webapp!.subscribeAsync(filter, { qos: 1 }).then(
        (granted) => granted[0]!.qos,
        (error: { packet?: { granted?: number[] } }) => error.packet?.granted?.[0] ?? Number.NaN,
      );
    for (const allowed of [
      "cloche/v1/+/plug/+/report",
      "cloche/v1/+/plug/+/presence",
      `cloche/v1/${site.slug}/plug/+/report`,
      `cloche/v1/${site.slug}/plug/heater-1/presence`,
    ]) {
      expect(await grant(allowed), allowed).not.toBe(128);
    }
    for (const refused of [
      "#",
      "cloche/v1/#",
      "cloche/v1/+/plug/+/command",
      `cloche/v1/${site.slug}/plug/heater-1/command`,
      "cloche/v1/+/plug/+/+",
      "cloche/v1/+/plug/#",
      "cloche/v1/+/sensor/+/reading",
      "cloche/v1/+/controller/wake",
      "$SYS/#",
    ]) {
      expect(await grant(refused), refused).toBe(128);
    }
  });
});
