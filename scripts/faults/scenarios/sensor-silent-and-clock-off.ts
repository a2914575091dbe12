// A sensor whose clock is an hour ahead, then an hour behind: its readings are stored
// at their arrival and still drive the heater. Then it goes silent: after the plug's
// stale limit the heater goes to its fail-safe ("on" here) and a silent-sensor alert is
// raised; the sensor's return closes the alert and gives the heater back to its band.
import type { FaultContext, FaultResult, FaultScenario } from "../scenario";
import { watchController } from "../support/controller-watch";
import { lastReadingId, lastSwitchId, loadSite, openAlerts, openDb, plugStates, readingsAfter, switchesAfter, doubledCommands, repeatedSwitches, type SwitchRow } from "../support/db";
import { closeDevice, connectDevice, publishReading, startScenarioPlug, waitFor, type DeviceLink } from "../support/devices";
import { makeScenarioHouse } from "../support/scenario-house";

/** The shortest stale limit a plug may have (lib/schemas/plug.ts). */
const STALE_AFTER_S = 60;
/** The controller judges staleness on its tick and its alert pass (5 s); some slack on top. */
const SLACK_MS = 15_000;
const HOUR_MS = 3600_000;
/** How far a stored time may be from the arrival. */
const ARRIVAL_SLACK_MS = 5000;

async function run(context: FaultContext): Promise<FaultResult> {
  const failures: string[] = [];
  const db = openDb(context.databaseUrl);
  const demo = await loadSite(db);
  const house = await makeScenarioHouse(context, demo, "quiet", { failsafe: "on", staleAfterS: STALE_AFTER_S, frostLowC: 8, frostHighC: 10 });
  const links: DeviceLink[] = [];
  try {
    const plug = await startScenarioPlug(context.mqttUrl, { site: house.site, device: house.plug.deviceId, secret: house.plug.secret });
    const sensor = await connectDevice(context.mqttUrl, { site: house.site, kind: "sensor", device: house.sensor.deviceId, secret: house.sensor.secret });
    links.push(plug.link, sensor);
    const firstReading = await lastReadingId(db);
    const watch = await watchController(db);
    // A new heater whose sensor has not been heard yet is in its fail-safe (on) at once; a
    // warm reading puts it back to its band (off). The scenario counts switches from there.
    await publishReading(sensor, house.site, house.sensor.deviceId, { temp_c: 15, at: new Date() });
    const settled = await waitFor(async () => {
      const state = (await plugStates(db, [house.plug.id])).get(house.plug.id);
      return state?.on === false && state.pendingOn === null ? true : null;
    }, SLACK_MS);
    if (!settled) throw new Error("the scenario heater did not settle off after a warm first reading");
    const firstSwitch = await lastSwitchId(db);
    const switches = () => switchesAfter(db, [house.plug.id], firstSwitch);
    const nextSwitch = (count: number, on: boolean, timeoutMs: number) =>
      waitFor(async () => {
        const rows = (await switches()).filter((r) => !r.withdrawnAt);
        return rows.length > count && rows.at(-1)!.toOn === on ? rows.at(-1)! : null;
      }, timeoutMs);

    // Clock an hour ahead: a cold reading must still switch the heater on.
    const aheadSent = Date.now();
    await publishReading(sensor, house.site, house.sensor.deviceId, { temp_c: 5, at: new Date(aheadSent + HOUR_MS) });
    const onAhead = await nextSwitch(0, true, SLACK_MS);
    if (!onAhead) failures.push("a cold reading from a sensor an hour ahead did not switch the heater on");
    else context.log(`clock 1 h ahead: 5 °C → heater on after ${onAhead.at.getTime() - aheadSent} ms (${onAhead.cause})`);

    // Clock an hour behind: a warm reading must switch it off again.
    const behindSent = Date.now();
    await publishReading(sensor, house.site, house.sensor.deviceId, { temp_c: 15, at: new Date(behindSent - HOUR_MS) });
    const offBehind = await nextSwitch(1, false, SLACK_MS);
    if (!offBehind) failures.push("a warm reading from a sensor an hour behind did not switch the heater off");
    else context.log(`clock 1 h behind: 15 °C → heater off after ${offBehind.at.getTime() - behindSent} ms (${offBehind.cause})`);

    // Silence: no more readings. The heater must go to its fail-safe, and the alert open.
    const lastHeardMs = behindSent;
    context.log(`sensor silent from now; fail-safe and alert expected after ${STALE_AFTER_S} s`);
    const failsafe = await nextSwitch(2, true, STALE_AFTER_S * 1000 + SLACK_MS * 2);
    const failsafeMs = failsafe ? failsafe.at.getTime() - lastHeardMs : null;
    if (!failsafe || failsafe.cause !== "failsafe") failures.push(`the heater did not go to its fail-safe (on) within ${STALE_AFTER_S + 30} s of the last reading${failsafe ? ` (it switched for ${failsafe.cause})` : ""}`);
    else if (failsafeMs! < STALE_AFTER_S * 1000) failures.push(`the heater went to its fail-safe after ${failsafeMs} ms, before the ${STALE_AFTER_S} s limit`);
    else context.log(`fail-safe: heater on ${(failsafeMs! / 1000).toFixed(1)} s after the last reading`);
    const alert = await waitFor(async () => (await openAlerts(db, { sensorId: house.sensor.id, kind: "sensor_quiet" }))[0] ?? null, SLACK_MS);
    const alertMs = alert ? alert.raisedAt.getTime() - lastHeardMs : null;
    if (!alert) failures.push("no silent-sensor alert was raised");
    else context.log(`silent-sensor alert raised ${(alertMs! / 1000).toFixed(1)} s after the last reading`);

    // Readings are written in batches: by now the two of the wrong clocks are stored.
    const stored = await readingsAfter(db, house.sensor.id, firstReading);
    for (const [sentMs, tempC, what] of [[aheadSent, 5, "ahead"], [behindSent, 15, "behind"]] as const) {
      const row = stored.find((r) => r.tempC === tempC && Math.abs(r.at.getTime() - sentMs) <= ARRIVAL_SLACK_MS);
      if (!row) failures.push(`the reading of the sensor an hour ${what} was not stored at its arrival (stored: ${stored.map((r) => `${r.tempC} °C at ${r.at.toISOString()}`).join(", ")})`);
    }

    // The sensor is back: the alert closes, the heater follows its band again (15 °C: off).
    await publishReading(sensor, house.site, house.sensor.deviceId, { temp_c: 15, at: new Date() });
    const back = await nextSwitch(3, false, SLACK_MS);
    if (!back) failures.push("the heater did not leave its fail-safe when the sensor came back");
    const cleared = await waitFor(async () => ((await openAlerts(db, { sensorId: house.sensor.id, kind: "sensor_quiet" })).length === 0 ? true : null), SLACK_MS);
    if (!cleared) failures.push("the silent-sensor alert stayed open after the sensor came back");

    const rows = await switches();
    const expected = [onAhead, offBehind, failsafe, back].filter((r): r is SwitchRow => r !== null);
    const extra = rows.filter((r) => !expected.some((x) => x.commandId === r.commandId));
    if (extra.length) failures.push(`unexpected switches: ${extra.map(describe).join(", ")} (all: ${rows.map(describe).join(", ")})`);
    const doubled = doubledCommands(rows).length + repeatedSwitches(rows).length;
    if (doubled) failures.push(`${doubled} doubled switches`);
    const watched = await watch.stop();
    if (watched.crashes) failures.push("the controller stopped or restarted during the scenario");
    // Devices go before their house: the controller must not be left writing about rows that are gone.
    for (const link of links.splice(0)) await closeDevice(link).catch(() => undefined);
    failures.push(...(await house.remove()));
    return {
      figures: { switchesLost: 4 - expected.length, switchesDoubled: doubled, longestControlGapMs: failsafeMs, crashes: watched.crashes, serverErrors: null },
      extra: { staleAfterS: STALE_AFTER_S, failsafeAfterMs: failsafeMs ?? "none", alertAfterMs: alertMs ?? "none", readingsStored: stored.length },
      failures,
    };
  } finally {
    for (const link of links) await closeDevice(link).catch(() => undefined);
    await house.remove();
    await db.end();
  }
}

function describe(r: SwitchRow) {
  return `#${r.id} ${r.cause} → ${r.toOn ? "on" : "off"}${r.withdrawnAt ? " (withdrawn)" : ""}${r.ackAt ? "" : " (unconfirmed)"}`;
}

export const sensorSilentAndClockOff: FaultScenario = {
  name: "sensor-silent-and-clock-off",
  quick: false,
  about: "a sensor an hour ahead, then an hour behind, then silent: its readings still drive the heater, then the heater goes to its fail-safe and a silent-sensor alert opens, and both end when it returns",
  run,
};
