// The broker restarted with every plug connected: it is embedded in the controller, so
// the controller is stopped with SIGTERM and the supervisor starts it again. A window
// opens while it is away. Every plug must be back (its presence "online" retained
// again), the window's plug switched, nothing lost or doubled.
import { CONTROLLER_USERNAME } from "../../../lib/mqtt/credentials";
import { plugTopic } from "../../../lib/mqtt/topics";
import { journalOf, timeToReach } from "../accounting";
import { mqttConnect, SITE, setOnWindow, wakeSite, withDatabase } from "../demo";
import { plugs } from "../../../db/schema";
import type { FaultScenario } from "../scenario";
import { ownPlugScenario, seconds, settle, sleep, wholeSecond } from "../steps";

export const brokerRestart: FaultScenario = {
  name: "broker-restarted",
  quick: false,
  about: "The controller and its embedded broker stopped (SIGTERM) and restarted with the plugs connected; a window opens meanwhile.",
  async run(context) {
    const { log, databaseUrl, mqttUrl } = context;
    const { processes, fromMs, failures, site, fan, controller } = await ownPlugScenario(context);
    const devices = await withDatabase(databaseUrl, async (db) => (await db.select({ deviceId: plugs.deviceId }).from(plugs)).map((p) => p.deviceId));

    const stopAtMs = Date.now() + 12_000;
    const edgeMs = wholeSecond(stopAtMs + 500);
    log(`${fan.deviceId} gets a window opening at ${new Date(edgeMs).toISOString()}, while the broker is away`);
    await setOnWindow(databaseUrl, site, fan, edgeMs, 10);
    await wakeSite(mqttUrl, processes.env, { reason: "schedule", plug: fan.deviceId });
    await sleep(stopAtMs - Date.now());

    const pid = controller.pid;
    if (!pid) throw new Error("the controller is not running");
    const restarted = controller.nextStart();
    processes.expectStop("controller");
    process.kill(pid, "SIGTERM");
    log(`controller with its broker (pid ${pid}) stopped with SIGTERM`);
    const newPid = await Promise.race([restarted, sleep(30_000).then(() => undefined)]);
    if (!newPid) failures.push("the supervisor did not start the controller again within 30 s");
    else log(`broker back (pid ${newPid}) ${seconds(Date.now() - stopAtMs)} after the stop`);

    // Plugs retry every 2 s; give them a few rounds, then read the retained presence.
    await sleep(12_000);
    const watcher = await mqttConnect(mqttUrl, CONTROLLER_USERNAME, processes.env.CLOCHE_MQTT_CONTROLLER_SECRET ?? "", 10_000);
    const presence = new Map<string, string>();
    watcher.on("message", (topic, payload) => presence.set(topic, payload.toString()));
    await watcher.subscribeAsync(devices.map((d) => plugTopic(SITE, d, "presence")), { qos: 1 });
    await sleep(1000);
    watcher.end(true);
    const away = devices.filter((d) => presence.get(plugTopic(SITE, d, "presence")) !== '"online"');
    log(`${devices.length - away.length} of ${devices.length} plugs online again`);
    if (away.length) failures.push(`plug(s) not back online after the restart: ${away.join(", ")}`);

    const journal = journalOf(processes.journalFile);
    const result = await settle(context, { fromMs, gaps: { "window opening": timeToReach(journal, fan.deviceId, true, edgeMs) }, failures, extra: { "plugs back": devices.length - away.length } });
    return result;
  },
};
