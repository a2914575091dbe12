// A plug losing its power: its process killed with SIGKILL while its window wants it
// on. The broker publishes its last will ("offline"), the controller raises the
// plug-offline alert, and when the plug comes back — in its own fail-safe state, its
// lease gone with the power — the controller finds it so and switches it back, once.
import { journalOf, timeToReach } from "../accounting";
import { alertsRaised, setOnWindow, setPlugOfflineAfter, wakeSite } from "../demo";
import type { FaultScenario } from "../scenario";
import { ownPlugScenario, seconds, settle, sleep, waitFor } from "../steps";

/** The shortest "plug offline after" a house's rules take (lib/alerts/rules.ts). */
const OFFLINE_AFTER_MIN = 1;

export const plugPower: FaultScenario = {
  name: "plug-lost-power",
  quick: false,
  about: "A plug's process killed (SIGKILL) while its window wants it on: offline alert, then resync when it returns.",
  async run(context) {
    const { log, databaseUrl, mqttUrl } = context;
    const { processes, fromMs, failures, site, fan } = await ownPlugScenario(context);
    const extra: Record<string, number | string> = {};

    log(`${fan.deviceId} gets a window open now; its house says "plug offline" after ${OFFLINE_AFTER_MIN} min`);
    await setPlugOfflineAfter(databaseUrl, fan.houseId, OFFLINE_AFTER_MIN);
    await setOnWindow(databaseUrl, site, fan, Date.now() - 5000, 30);
    await wakeSite(mqttUrl, processes.env, { reason: "config" });
    const on = await waitFor(() => journalOf(processes.journalFile).findLast((e) => e.device === fan.deviceId)?.on === true, 30_000, 200);
    if (!on) failures.push(`${fan.deviceId} did not come on for its window before the power cut`);

    const killedMs = Date.now();
    await processes.plug.kill();
    log(`${fan.deviceId} lost its power (SIGKILL)`);
    const alert = await waitFor(async () => (await alertsRaised(databaseUrl, fan.id, "plug_offline", killedMs - 1000))[0], (OFFLINE_AFTER_MIN * 60 + 60) * 1000, 2000);
    if (!alert) failures.push(`no plug-offline alert within ${OFFLINE_AFTER_MIN + 1} min of the power cut`);
    else {
      extra["alert after s"] = Math.round((alert.raisedAt.getTime() - killedMs) / 1000);
      log(`plug-offline alert raised ${seconds(alert.raisedAt.getTime() - killedMs)} after the power cut`);
    }

    const backMs = Date.now();
    await processes.plug.start();
    log(`${fan.deviceId} has its power back`);
    const resynced = await waitFor(() => journalOf(processes.journalFile).find((e) => e.device === fan.deviceId && e.atMs > backMs && e.what === "command" && e.on), 30_000, 100);
    if (!resynced) failures.push(`${fan.deviceId} was not switched back on within 30 s of its return`);
    else log(`${fan.deviceId} switched back on ${seconds(resynced.atMs - backMs)} after its return`);
    const cleared = await waitFor(async () => (await alertsRaised(databaseUrl, fan.id, "plug_offline", killedMs - 1000)).every((a) => a.clearedAt !== null), 20_000, 2000);
    extra["alert cleared"] = cleared ? "yes" : "no";
    if (!cleared) failures.push("the plug-offline alert was not cleared within 20 s of the plug's return");
    await sleep(3000);

    const journal = journalOf(processes.journalFile);
    const start = journal.find((e) => e.device === fan.deviceId && e.what === "start" && e.atMs >= backMs);
    return settle(context, { fromMs, gaps: { "return to on": start ? timeToReach(journal, fan.deviceId, true, start.atMs) : null }, failures, extra });
  },
};
