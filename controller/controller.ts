// The controller: keeps the current picture of every plug and sensor in memory,
// decides each plug's state when something changes (and on a tick as a backstop),
// sends commands with a lease, proves each switch by its echoed command id, and
// writes every switch to MariaDB. This file only puts the rooms together:
//   registry.ts      plugs, sensors, schedules, overrides, latest readings
//   inbox.ts         what arrives: topic routing and payload checks
//   switching.ts     each plug's switch lifecycle (lib/control/switch-lifecycle.ts), effects applied
//   outbox.ts        commands on their way to the broker
//   switch-log.ts    the switch log and plug_states; readings-store.ts readings and presence
//   alert-wording.ts what the decision's alerts say; alert-watch.ts the house's alert rules; alerts.ts stores them
//   timers.ts, heartbeat.ts, startup.ts
import { randomUUID } from "node:crypto";
import pino, { type Logger } from "pino";
import { connect, type Database } from "@/db/client";
import { findDeviceCredential, loadDeviceCredentials } from "@/db/device-credentials";
import { loadPlugStates, storedSwitchState } from "@/db/plug-states";
import type { Decision } from "@/lib/control";
import { restoredState } from "@/lib/control/switch-lifecycle";
import { CONTROLLER_USERNAME } from "@/lib/mqtt/credentials";
import { createAlerts } from "./alerts";
import { createAlertWatch } from "./alert-watch";
import { createBroker, type Broker } from "./broker";
import { loadConfig, loadLatestReadings } from "./config";
import { createCredentials } from "./credentials";
import { createHeartbeat } from "./heartbeat";
import { INBOX_SUBSCRIPTIONS, createInbox } from "./inbox";
import { connectNetworkLink, type BrokerLink } from "./link";
import { createOutbox } from "./outbox";
import { createReadingsStore } from "./readings-store";
import { createRegistry } from "./registry";
import { untilDatabaseAnswers } from "./startup";
import { createEnergyRollup } from "./energy-rollup";
import { createSwitchLog } from "./switch-log";
import { createSwitching } from "./switching";
import { createTimers } from "./timers";
import { createTrafficLog } from "./traffic-log";
import type { TrafficLimits } from "@/lib/mqtt/traffic-limit";
import { logDetail } from "@/lib/database-errors";

export type ControllerOptions = {
  databaseUrl: string;
  /** An external broker; when unset the controller runs its own on mqttHost:mqttPort. */
  mqttUrl?: string;
  mqttHost: string;
  /** 0 picks a free port (tests). */
  mqttPort: number;
  controllerSecret: string;
  webappSecret: string;
  /** Only these sites (by slug); all when unset. */
  sites?: string[];
  tickMs: number;
  ackTimeoutMs: number;
  maxRetryMs: number;
  /** Unanswered sends of one command before a plug_unanswered alert. */
  unansweredAfter: number;
  /** How often the time-based alert rules (silent sensor, plug offline, …) are looked at. */
  alertWatchMs: number;
  /** The backstop reload of every site; a change made in the app wakes its site at once. */
  configReloadMs: number;
  /** How long to wait for plugs' retained reports before deciding without them. */
  startupGraceMs: number;
  flushMs: number;
  /** How long written switches and meter samples gather before the energy roll-up takes them in. */
  energyRollupMs: number;
  /** A metering plug's counter is kept at most this often (and at every change of state). */
  meterSampleMs: number;
  heartbeatMs: number;
  /** The embedded broker's per-device limits (its defaults where unset). */
  deviceLimits?: Partial<TrafficLimits>;
  /** How often what the broker's limits did is written to device_traffic. */
  trafficLogMs: number;
  rawReadingRetentionMs: number;
  /**
   * The longest wait for one database statement. Nothing between a reading and the
   * command it leads to waits on the database; this bounds the writers and reloads
   * beside that path, so a database that hangs cannot hold them for ever.
   */
  databaseTimeoutMs: number;
  now: () => number;
  logger: Logger;
};

const defaults: Omit<ControllerOptions, "databaseUrl" | "controllerSecret" | "webappSecret" | "logger"> = {
  mqttHost: "127.0.0.1",
  mqttPort: 1886,
  tickMs: 1000,
  ackTimeoutMs: 2000,
  maxRetryMs: 30_000,
  unansweredAfter: 4,
  alertWatchMs: 5000,
  configReloadMs: 30_000,
  startupGraceMs: 1500,
  flushMs: 250,
  energyRollupMs: 2000,
  meterSampleMs: 60_000,
  heartbeatMs: 5000,
  trafficLogMs: 5000,
  rawReadingRetentionMs: 7 * 24 * 3600_000,
  databaseTimeoutMs: 10_000,
  now: Date.now,
};

/** How long start-up waits for an external broker to take the subscriptions. */
const SUBSCRIBE_WAIT_MS = 10_000;

export type ControllerStats = {
  dropped: Record<string, number>;
  commandsSent: number;
  switchesLogged: number;
  acknowledged: number;
  evaluations: number;
  /** Switches, acknowledgements and plug states waiting for MariaDB (non-zero while it is unreachable). */
  switchesUnwritten: number;
  readingsUnwritten: number;
};

export type Controller = {
  mqttUrl: string;
  broker: Broker | null;
  stats: () => ControllerStats;
  /** The decision and state of a plug, for tests and the status line. */
  plug: (siteSlug: string, deviceId: string) => { knownOn: boolean | null; last: Decision | null; pending: boolean } | undefined;
  /** Reload configuration (all sites, or the one given) and evaluate everything now. */
  reload: (siteSlug?: string) => Promise<void>;
  flush: () => Promise<void>;
  close: () => Promise<void>;
};

export async function createController(input: Partial<ControllerOptions> & Pick<ControllerOptions, "databaseUrl" | "controllerSecret" | "webappSecret">): Promise<Controller> {
  const options: ControllerOptions = { ...defaults, logger: pino({ name: "controller" }), ...input };
  const { logger, now } = options;
  const { db, pool } = connect(options.databaseUrl, { timeoutMs: options.databaseTimeoutMs });
  const timers = createTimers();
  let closed = false;
  let startedMs = now();
  /** Set once start-up is done; until then a reload leaves the edge timer alone. */
  let edgesArmed = false;

  const energy = createEnergyRollup({ db, logger, delayMs: options.energyRollupMs });
  const switchLog = createSwitchLog({ db, logger, flushMs: options.flushMs, maxBatch: 1000, onWritten: energy.changed });
  // When each metering plug's counter was last kept, and in which state.
  const lastSample = new Map<string, { atMs: number; on: boolean }>();
  const store = createReadingsStore({ db, logger, flushMs: Math.max(options.flushMs, 1000), maxBatch: 1000, maxWaiting: 200_000, rawRetentionMs: options.rawReadingRetentionMs, now });
  const alerts = createAlerts({ db, logger, now });
  const heartbeat = createHeartbeat({ db, instanceId: randomUUID(), sites: options.sites, everyMs: options.heartbeatMs, now, logger });
  const registry = createRegistry();
  const credentials = createCredentials();
  // Started once the configuration (and with it the devices' credentials) is in.
  let broker: Broker | null = null;
  const trafficLog = createTrafficLog({ db, logger, everyMs: options.trafficLogMs });
  const alertWatch = createAlertWatch({ alerts, registry, logger, ackTimeoutMs: options.ackTimeoutMs, everyMs: options.alertWatchMs, now });
  const outbox = createOutbox({ logger });
  let staleReports = 0;
  const switching = createSwitching({
    registry,
    outbox,
    switchLog,
    alerts,
    settings: { ackTimeoutMs: options.ackTimeoutMs, maxRetryMs: options.maxRetryMs, unansweredAfter: options.unansweredAfter },
    graceEndsMs: () => startedMs + options.startupGraceMs,
    onStaleReport: () => staleReports++,
  });

  /** Loads the given site (or every site served) and takes it in; new plugs start from their stored state. */
  async function reload(siteSlug?: string) {
    const slugs = siteSlug ? [siteSlug] : options.sites;
    const config = await loadConfig(db, new Date(now()), slugs);
    const siteIds = config.sites.map((s) => s.id);
    const [stored, signIns] = await Promise.all([loadPlugStates(db, registry.unknownPlugs(config).map((p) => p.id)), loadDeviceCredentials(db, siteIds)]);
    const startMs = now();
    registry.apply(config, (plug) => restoredState(storedSwitchState(stored.get(plug.id), startMs), startMs), !siteSlug);
    credentials.replace(siteIds, signIns, !siteSlug);
    // A credential revoked or replaced since its device signed in ends that session now.
    broker?.recheckDevices(siteSlug);
    // Rules saved in the app apply at once: the latest readings are looked at again.
    alertWatch.reloaded(now());
    // New windows or overrides may bring the next edge closer.
    if (edgesArmed) armEdge();
    logger.info({ site: siteSlug ?? "all", sites: config.sites.length, plugs: config.plugs.length, sensors: config.sensors.length, credentials: signIns.length }, "configuration loaded");
  }

  // Start-up: MariaDB may still be coming up; keep trying.
  await untilDatabaseAnswers(logger, async () => {
    await reload();
    await alerts.load();
    const startNow = now();
    for (const r of await loadLatestReadings(db, registry.sensorIds(), new Date(startNow))) {
      // Age it by when it was taken: a restart must not make an old reading look fresh.
      registry.setReading(r.sensorId, { tempC: r.tempC, rh: r.rh, battery: r.battery, atMs: Math.min(r.at.getTime(), startNow) });
    }
  });

  let mqttUrl = options.mqttUrl;
  if (!mqttUrl) {
    broker = await createBroker({
      host: options.mqttHost,
      port: options.mqttPort,
      controllerSecret: options.controllerSecret,
      webappSecret: options.webappSecret,
      deviceSecret: credentials.secretHash,
      async lookUpDeviceSecret(username) {
        const found = await findDeviceCredential(db, username);
        credentials.learn(username, found);
        return found?.secretHash ?? null;
      },
      logger: logger.child({ part: "broker" }),
      deviceLimits: options.deviceLimits,
      onLimit: trafficLog.record,
    });
    mqttUrl = `mqtt://${options.mqttHost}:${broker.port}`;
  }

  function tick() {
    const nowMs = now();
    outbox.batch(() => {
      for (const runtime of registry.plugs()) {
        switching.evaluate(runtime, nowMs);
        switching.timer(runtime, nowMs);
      }
    });
    alertWatch.tick(nowMs);
  }

  // A wake-up from the web app reloads its site alone, a few at once if they come together.
  const served = options.sites ? new Set(options.sites) : null;
  function reloadSoon(siteSlug?: string) {
    const name = `reload:${siteSlug ?? "*"}`;
    if (timers.pending(name)) return;
    timers.at(name, 50, () => {
      reload(siteSlug)
        .then(() => tick())
        .catch((error: unknown) => logger.error({ ...logDetail(error), site: siteSlug }, "configuration reload failed; keeping the last one"));
    });
  }

  const inbox = createInbox({
    now,
    logger,
    handlers: {
      reading(site, device, r, nowMs) {
        const sensor = registry.sensor(site, device);
        if (!sensor) return "unknown_sensor";
        // Staleness is judged by when the reading arrived, not by the sensor's own clock;
        // the stored time is the sensor's unless that clock is clearly off.
        const claimed = Date.parse(r.at);
        const takenAt = Math.abs(claimed - nowMs) <= 5 * 60_000 ? claimed : nowMs;
        const latest = { tempC: r.temp_c, rh: r.rh ?? null, battery: r.battery ?? null, atMs: nowMs };
        registry.setReading(sensor.id, latest);
        store.add({ sensorId: sensor.id, at: new Date(takenAt), tempC: r.temp_c, rh: latest.rh, battery: latest.battery });
        store.sensorSeen(sensor.id, true, new Date(nowMs));
        for (const runtime of registry.plugsFollowing(sensor.id)) switching.evaluate(runtime, nowMs);
        alertWatch.reading(sensor, latest, nowMs);
      },
      report(site, device, report, nowMs) {
        const runtime = registry.plug(site, device);
        if (!runtime) return "unknown_plug";
        const plugTimeMs = Date.parse(report.at);
        // A report older than one already heard (late, repeated) says only that the plug is there.
        const fresh = switching.report(runtime, { on: report.on, cmd: report.cmd ?? null, plugTimeMs }, nowMs);
        switchLog.present(runtime.config.id, {
          online: true,
          lastSeenAt: new Date(nowMs),
          ...(fresh && {
            reportedOn: report.on,
            reportedAt: new Date(plugTimeMs),
            watts: report.watts === undefined || report.watts === null ? null : Math.round(report.watts),
            wattHours: report.wh === undefined || report.wh === null ? null : Math.round(report.wh),
          }),
        });
        if (fresh && runtime.config.metersEnergy && typeof report.wh === "number" && report.wh >= 0) {
          const last = lastSample.get(runtime.config.id);
          if (!last || last.on !== report.on || nowMs - last.atMs >= options.meterSampleMs) {
            lastSample.set(runtime.config.id, { atMs: nowMs, on: report.on });
            switchLog.meter(runtime.config.id, new Date(nowMs), Math.round(report.wh));
          }
        }
        alertWatch.heard(runtime, nowMs);
      },
      presence(site, device, online, nowMs) {
        const runtime = registry.plug(site, device);
        if (!runtime) return "unknown_plug";
        switchLog.present(runtime.config.id, { online, lastSeenAt: new Date(nowMs) });
        switching.presence(runtime, online, nowMs);
        alertWatch.presence(runtime, online, nowMs);
      },
      wake(site) {
        if (served && !served.has(site)) return;
        reloadSoon(site);
      },
    },
  });

  // Schedule edges and override ends: wake exactly then, so a change does not wait
  // for the backstop tick.
  function armEdge() {
    if (closed) return;
    const nowMs = now();
    let next = Number.POSITIVE_INFINITY;
    for (const runtime of registry.plugs()) {
      const edge = runtime.schedule.nextChangeAfter(nowMs);
      if (edge !== null && edge < next) next = edge;
      for (const o of runtime.overrides) if (o.endsMs > nowMs && o.endsMs < next) next = o.endsMs;
    }
    // Measured after the loop: compiling schedules afresh (after a reload) takes a while.
    const delay = Math.min(Math.max(0, next - now()), options.tickMs * 60);
    timers.at("edge", delay, () => {
      tick();
      armEdge();
    });
  }

  const linkOptions = { subscriptions: INBOX_SUBSCRIPTIONS, onMessage: inbox.onMessage, logger: logger.child({ part: "link" }) };
  // Its own broker it reaches in-process; an external one over the network.
  const link: BrokerLink = broker
    ? await broker.link(linkOptions)
    : connectNetworkLink({ ...linkOptions, url: mqttUrl, username: CONTROLLER_USERNAME, password: options.controllerSecret });
  outbox.attach(link);
  // The grace for the plugs' retained reports starts when they can arrive: an external
  // broker may take a while to connect. Past the wait, plugs are decided on without them.
  await Promise.race([link.subscribed, new Promise((resolve) => setTimeout(resolve, SUBSCRIBE_WAIT_MS).unref())]);
  startedMs = now();
  timers.every(options.tickMs, tick);
  timers.every(options.configReloadMs, () => reloadSoon());
  timers.every(options.heartbeatMs, () => void heartbeat.beat());
  await heartbeat.beat();
  edgesArmed = true;
  armEdge();

  let closing: Promise<void> | undefined;
  return {
    mqttUrl,
    broker,
    stats: () => ({
      ...switching.stats(),
      dropped: { ...inbox.dropped(), ...(staleReports ? { stale_report: staleReports } : {}) },
      switchesUnwritten: switchLog.waiting(),
      energyRollupWaiting: energy.waiting(),
      readingsUnwritten: store.waiting(),
    }),
    plug(siteSlug, deviceId) {
      const r = registry.plug(siteSlug, deviceId);
      return r && { knownOn: r.switching.on, last: r.last, pending: r.switching.command !== null };
    },
    reload: async (siteSlug) => {
      await reload(siteSlug);
      tick();
    },
    flush: async () => {
      await switchLog.flush();
      await store.flush();
      await energy.flush();
      await trafficLog.flush();
    },
    close: () =>
      (closing ??= (async () => {
        closed = true;
        timers.clearAll();
        outbox.close();
        await link.close();
        await switchLog.close();
        await energy.close();
        await store.close();
        await heartbeat.stopped();
        await broker?.close();
        await trafficLog.close();
        await pool.end();
        logger.info("controller stopped");
      })()),
  };
}

export type { Database };
