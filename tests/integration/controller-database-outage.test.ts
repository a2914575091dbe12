// MariaDB goes away while the controller switches plugs: the plugs are still
// switched, the switches wait in memory, and once MariaDB is back they are written
// in order, each once, with their acknowledgements.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { asc, eq, gt } from "drizzle-orm";
import type { MqttClient } from "mqtt";
import { getDb } from "@/db/client";
import { switchEvents } from "@/db/schema";
import { createController, type Controller } from "@/controller/controller";
import type { PlugDevice } from "@/fakes/plug-device";
import { deviceUsername } from "@/lib/mqtt/credentials";
import { sensorTopic } from "@/lib/mqtt/topics";
import { connectAs, createControlSite, eventually, testControllerOptions, startTestHeater, type ControlSite } from "../support/control-site";
import { startTcpProxy, type TcpProxy } from "../support/tcp-proxy";

let site: ControlSite;
let proxy: TcpProxy;
let controller: Controller;
let heater: PlugDevice;
let sensor: MqttClient;
let temperature = 12.5;
let feeding: NodeJS.Timeout | undefined;

async function publishReading(tempC: number) {
  await sensor.publishAsync(sensorTopic(site.slug, "air-1"), JSON.stringify({ temp_c: tempC, rh: 80, at: new Date().toISOString() }), { qos: 1 });
}

/** Switches the heater by its sensor and waits until the plug itself has switched. */
async function switchHeater(on: boolean) {
  temperature = on ? 8 : 12.5;
  await publishReading(temperature);
  await eventually(() => heater.on === on && !controller.plug(site.slug, "heater-1")?.pending, 5000, `heater ${on ? "on" : "off"}`);
}

/** Switches of the heater stored after `afterId`, as MariaDB has them (read directly, not through the proxy). */
function storedSince(afterId: number) {
  return getDb().select().from(switchEvents).where(eq(switchEvents.plugId, site.heaterId)).orderBy(asc(switchEvents.id)).then((rows) => rows.filter((r) => r.id > afterId));
}

async function lastStoredId() {
  await controller.flush();
  const rows = await getDb().select({ id: switchEvents.id }).from(switchEvents).where(gt(switchEvents.id, 0)).orderBy(asc(switchEvents.id));
  return rows.at(-1)?.id ?? 0;
}

beforeAll(async () => {
  site = await createControlSite(getDb());
  const url = new URL(process.env.DATABASE_URL!);
  proxy = await startTcpProxy({ host: url.hostname, port: Number(url.port) });
  url.host = `127.0.0.1:${proxy.port}`;
  controller = await createController(testControllerOptions(site, { databaseUrl: url.toString() }));
  heater = await startTestHeater(site, controller.mqttUrl);
  sensor = await connectAs(controller.mqttUrl, deviceUsername(site.slug, "sensor", "air-1"), site.secret("sensor", "air-1"));
  feeding = setInterval(() => void publishReading(temperature).catch(() => undefined), 200);
  await switchHeater(false);
});

afterAll(async () => {
  clearInterval(feeding);
  await sensor?.endAsync();
  await heater?.close();
  await controller?.close();
  await proxy?.close();
});

describe("the controller while MariaDB is unreachable", () => {
  it("keeps switching, and writes the switches in order once MariaDB is back", async () => {
    const before = await lastStoredId();
    proxy.cut();

    const wanted = [true, false, true, false];
    for (const on of wanted) await switchHeater(on);
    await controller.flush(); // fails quietly: the rows stay waiting
    expect(controller.stats().switchesUnwritten).toBeGreaterThanOrEqual(wanted.length);
    expect(await storedSince(before)).toEqual([]);

    proxy.restore();
    const rows = await eventually(async () => {
      await controller.flush();
      const stored = await storedSince(before);
      return stored.length >= wanted.length && stored.every((r) => r.ackAt) ? stored : undefined;
    }, 10_000, "switches written after the outage");

    expect(rows.map((r) => r.toOn)).toEqual(wanted);
    expect(rows.map((r) => r.fromOn)).toEqual([false, true, false, true]);
    for (let i = 1; i < rows.length; i++) expect(rows[i]!.at.getTime()).toBeGreaterThan(rows[i - 1]!.at.getTime());
    expect(new Set(rows.map((r) => r.commandId)).size).toBe(rows.length);
    for (const r of rows) {
      expect(r.cause).toBe("schedule");
      // Acknowledged during the outage; the acknowledgement was kept with the row.
      expect(r.latencyMs).toBeGreaterThanOrEqual(0);
      expect(r.ackAt!.getTime()).toBeGreaterThanOrEqual(r.at.getTime());
    }
    // Nothing is left waiting (a reading fed meanwhile may have made a newer switch; it is written at the next flush).
    await eventually(async () => {
      await controller.flush();
      return controller.stats().switchesUnwritten === 0;
    }, 5_000, "nothing left unwritten");
  });

  it("writes a switch once when the connection drops after MariaDB committed it but before it answered", async () => {
    const before = await lastStoredId();
    // The switch log writes in one transaction with the plugs' present state: the
    // answer that can be lost after the work is done is the COMMIT's.
    proxy.swallowRepliesFrom(/commit/i);
    await switchHeater(true);
    // MariaDB has the row, but the controller never heard so and will write it again.
    const [stored] = await eventually(async () => {
      const rows = await storedSince(before);
      return rows.length > 0 ? rows : undefined;
    }, 5000, "the row reaching MariaDB");
    await new Promise((resolve) => setTimeout(resolve, 200));
    expect(controller.stats().switchesUnwritten).toBeGreaterThan(0);

    proxy.restore();
    const rows = await eventually(async () => {
      await controller.flush();
      return controller.stats().switchesUnwritten === 0 ? storedSince(before) : undefined;
    }, 10_000, "the retry after the lost answer");
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ commandId: stored!.commandId, toOn: true, fromOn: false });
    expect(rows[0]!.ackAt).not.toBeNull();
  });
});
