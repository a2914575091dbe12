// A heater's reports sent twice, late (an old time and an old command id) and out of
// order, and its sensor's readings repeated and out of order. The switch log must hold
// exactly the real switches, once each, and the plug's state must never go back to
// what an old report said.
import type { FaultContext, FaultResult, FaultScenario } from "../scenario";
import { watchController } from "../support/controller-watch";
import { doubledCommands, lastSwitchId, openDb, plugStates, repeatedSwitches, switchesAfter, loadSite, type Db, type SwitchRow } from "../support/db";
import { connectDevice, closeDevice, publishReading, publishReport, sleep, startScenarioPlug, waitFor, type DeviceLink, type PlugReport } from "../support/devices";
import { makeScenarioHouse, type ScenarioHouse } from "../support/scenario-house";

const SWITCH_WAIT_MS = 15_000;

async function run(context: FaultContext): Promise<FaultResult> {
  const failures: string[] = [];
  const db = openDb(context.databaseUrl);
  const demo = await loadSite(db);
  const house = await makeScenarioHouse(context, demo, "late", { frostLowC: 8, frostHighC: 10 });
  const links: DeviceLink[] = [];
  try {
    const plug = await startScenarioPlug(context.mqttUrl, { site: house.site, device: house.plug.deviceId, secret: house.plug.secret });
    const sensor = await connectDevice(context.mqttUrl, { site: house.site, kind: "sensor", device: house.sensor.deviceId, secret: house.sensor.secret });
    links.push(plug.link, sensor);
    const firstId = await lastSwitchId(db);
    const watch = await watchController(db);
    const reading = (tempC: number, at = new Date()) => publishReading(sensor, house.site, house.sensor.deviceId, { temp_c: tempC, at });
    const report = (r: PlugReport) => publishReport(plug.link, house.site, house.plug.deviceId, r);

    /** Sends a reading and waits for the switch it must cause, confirmed by the plug. */
    async function realSwitch(tempC: number, on: boolean, already: number): Promise<SwitchRow> {
      await reading(tempC);
      const row = await waitFor(async () => {
        const rows = (await switchesAfter(db, [house.plug.id], firstId)).filter((r) => !r.withdrawnAt);
        return rows.length > already && rows.at(-1)!.toOn === on && rows.at(-1)!.ackAt ? rows.at(-1)! : null;
      }, SWITCH_WAIT_MS);
      if (!row) throw new Error(`a reading of ${tempC} °C did not switch the heater ${on ? "on" : "off"} within ${SWITCH_WAIT_MS / 1000} s`);
      return row;
    }

    await reading(15);
    await sleep(1500);
    const on1 = await realSwitch(5, true, 0);
    const report1 = { on: true, cmd: on1.commandId, at: new Date(plug.commands.at(-1)!.atMs) };
    context.log(`real switch 1: on (${on1.commandId})`);

    // Duplicates: the same report five more times, as a plug might redeliver it.
    for (let i = 0; i < 5; i++) await report(report1);
    await sleep(1500);

    const off1 = await realSwitch(15, false, 1);
    context.log(`real switch 2: off (${off1.commandId})`);

    // Late: the "on" report of switch 1 again, with its old time and old command id.
    for (let i = 0; i < 5; i++) await report(report1);
    // Out of order: a report stamped a moment before the plug's newest, saying "on".
    await report({ on: true, cmd: off1.commandId, at: new Date(Date.now() - 3000) });
    await sleep(2000);
    const afterLate = (await plugStates(db, [house.plug.id])).get(house.plug.id);
    if (afterLate?.on !== false) failures.push(`after late "on" reports the plug's state is ${String(afterLate?.on)}, not off as its newest report says`);
    if (afterLate?.reportedOn !== false) failures.push(`after late "on" reports the plug's last report is stored as ${String(afterLate?.reportedOn)} (plug_states.reported_on went back to an old report)`);

    const on2 = await realSwitch(5, true, 2);
    context.log(`real switch 3: on (${on2.commandId})`);

    // Readings repeated and out of order: the same warm-enough reading three times, then
    // one stamped 30 s earlier; none of them crosses an edge, so none may switch.
    const now = new Date();
    for (let i = 0; i < 3; i++) await reading(9, now);
    await reading(9.5, new Date(now.getTime() - 30_000));
    await sleep(2000);

    const rows = await switchesAfter(db, [house.plug.id], firstId);
    await checkLog(db, house, rows, [on1, off1, on2], failures);
    const watched = await watch.stop();
    if (watched.crashes) failures.push("the controller stopped or restarted during the scenario");
    const doubled = doubledCommands(rows).length + repeatedSwitches(rows).length;
    // Devices go before their house: the controller must not be left writing about rows that are gone.
    for (const link of links.splice(0)) await closeDevice(link).catch(() => undefined);
    failures.push(...(await house.remove()));
    return {
      figures: { switchesLost: 3 - [on1, off1, on2].filter((r) => rows.some((x) => x.commandId === r.commandId && x.ackAt)).length, switchesDoubled: doubled, longestControlGapMs: null, crashes: watched.crashes, serverErrors: null },
      extra: { realSwitches: 3, loggedRows: rows.length, duplicateReports: 5, lateReports: 6, outOfOrderReadings: 1, repeatedReadings: 3 },
      failures,
    };
  } finally {
    for (const link of links) await closeDevice(link).catch(() => undefined);
    await house.remove();
    await db.end();
  }
}

async function checkLog(db: Db, house: ScenarioHouse, rows: SwitchRow[], real: SwitchRow[], failures: string[]) {
  // A new plug's first report is written down as observed (from nothing to its state): not a switch.
  const extra = rows.filter((r) => !real.some((x) => x.commandId === r.commandId) && r.fromOn !== null);
  if (extra.length) failures.push(`the switch log has ${extra.length} rows besides the 3 real switches: ${extra.map((r) => `${r.cause} → ${r.toOn ? "on" : "off"}`).join(", ")}`);
  if (doubledCommands(rows).length) failures.push(`command ids logged twice: ${doubledCommands(rows).join(", ")}`);
  const repeated = repeatedSwitches(rows);
  if (repeated.length) failures.push(`${repeated.length} switches to a state the plug was already in`);
  const state = (await plugStates(db, [house.plug.id])).get(house.plug.id);
  if (state?.on !== true || state.switchCommandId !== real[2]!.commandId) {
    failures.push(`the plug's state is ${String(state?.on)} from ${state?.switchCommandId ?? "nothing"}, not on from the last real switch`);
  }
}

export const staleReports: FaultScenario = {
  name: "duplicate-late-reports",
  quick: true,
  about: "a heater's reports sent twice, late and out of order, and readings repeated and out of order; only real switches are logged, once, and no state goes back",
  run,
};
