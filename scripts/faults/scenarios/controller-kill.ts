// The controller killed with SIGKILL just after a window opened and its command went
// out, before the plug's echo can be written: the supervisor starts it again, and the
// restarted controller carries on from the stored state — the switch logged once, the
// plug in the wanted state.
import { journalOf, timeToReach } from "../accounting";
import { setOnWindow, wakeSite } from "../demo";
import type { FaultScenario } from "../scenario";
import { ownPlugScenario, seconds, settle, sleep, waitFor, wholeSecond } from "../steps";

export const controllerKill: FaultScenario = {
  name: "controller-killed-at-an-edge",
  quick: true,
  about: "SIGKILL to the controller the moment a window's command reaches its plug; the supervisor restarts it.",
  async run(context) {
    const { log, databaseUrl, mqttUrl } = context;
    const { processes, fromMs, failures, site, fan, controller } = await ownPlugScenario(context);

    const edgeMs = wholeSecond(Date.now() + 12_000);
    log(`${fan.deviceId} gets a window opening at ${new Date(edgeMs).toISOString()}`);
    await setOnWindow(databaseUrl, site, fan, edgeMs, 10);
    await wakeSite(mqttUrl, processes.env, { reason: "schedule", plug: fan.deviceId });
    await sleep(edgeMs - Date.now() - 2000);

    const command = await waitFor(() => journalOf(processes.journalFile).find((e) => e.device === fan.deviceId && e.what === "command" && e.on && e.atMs >= edgeMs - 1000), 10_000, 5);
    const pid = controller.pid;
    if (!command || !pid) {
      failures.push(command ? "the controller was not running at the edge" : "the window's command did not reach the plug within 8 s of the edge");
      return settle(context, { fromMs, gaps: {}, failures });
    }
    const restarted = controller.nextStart();
    processes.expectStop("controller");
    process.kill(pid, "SIGKILL");
    log(`controller (pid ${pid}) killed ${Date.now() - command.atMs} ms after ${fan.deviceId} obeyed command ${command.id}`);
    const newPid = await Promise.race([restarted, sleep(30_000).then(() => undefined)]);
    if (!newPid) failures.push("the supervisor did not start the controller again within 30 s");
    else log(`the supervisor started the controller again (pid ${newPid}) after ${seconds(Date.now() - command.atMs)}`);

    // The restarted controller takes its pending switch from plug_states, hears the
    // retained report and completes it; a few seconds for that and a lease refresh.
    await sleep(15_000);
    const journal = journalOf(processes.journalFile);
    const endsOn = journal.findLast((e) => e.device === fan.deviceId)?.on;
    if (endsOn !== true) failures.push(`${fan.deviceId} ended ${endsOn ? "on" : "off"}, not on as its window wants`);
    return settle(context, { fromMs, gaps: { "window opening": timeToReach(journal, fan.deviceId, true, edgeMs) }, failures });
  },
};
