// The controller: keeps the current picture of every plug and sensor in memory,
// decides each plug's state when something changes (and on a tick as a backstop),
// sends commands with a lease, proves each switch by its echoed command id, and
// writes every switch to MariaDB.
import { randomUUID } from "node:crypto";
import pino, { type Logger } from "pino";
import { connect, type Database } from "@/db/client";
import { decide, type Decision, type PlugRules } from "@/lib/control";
import { groupBy } from "@/lib/group-by";
import { CONTROLLER_USERNAME } from "@/lib/mqtt/credentials";
import {
  TOPIC_ROOT,
  decode,
  parseTopic,
  plugTopic,
  presencePayload,
  readingPayload,
  reportPayload,
  wakePayload,
} from "@/lib/mqtt/topics";
import { compilePlugSchedule, type PlugSchedule } from "./plug-schedule";
import { createAlerts, type Alerts } from "./alerts";
import { createBroker, type Broker } from "./broker";
import { connectNetworkLink, type BrokerLink } from "./link";
import { loadConfig, loadLastSwitches, loadLatestReadings, rulesOf, type Config, type OverrideConfig, type PlugConfig, type SiteConfig } from "./config";
import { lookupDeviceSecret } from "@/db/device-credentials";
import { createReadingsStore, type ReadingsStore } from "./readings-store";
import { createSwitchLog, type SwitchLog } from "./switch-log";

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
  /** Unanswered attempts before a plug_unanswered alert. */
  unansweredAfter: number;
  configReloadMs: number;
  /** How long to wait for plugs' retained reports before deciding without them. */
  startupGraceMs: number;
  flushMs: number;
  rawReadingRetentionMs: number;
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
  configReloadMs: 30_000,
  startupGraceMs: 1500,
  flushMs: 250,
  rawReadingRetentionMs: 7 * 24 * 3600_000,
  now: Date.now,
};

type Pending = {
  id: string;
  on: boolean;
  firstSentMs: number;
  nextTryMs: number;
  attempts: number;
  /** A change of state (logged) rather than a lease refresh. */
  isSwitch: boolean;
};

type PlugRuntime = {
  config: PlugConfig;
  site: SiteConfig;
  rules: PlugRules;
  schedule: PlugSchedule;
  /** What the schedule was compiled from. */
  scheduleKey: string;
  overrides: (OverrideConfig & { endsMs: number })[];
  topic: string;
  /** The state the switch log says the plug is in (null: never logged). */
  knownOn: boolean | null;
  sinceMs: number;
  reported: { on: boolean; cmd: string | null; atMs: number; watts: number | null; wh: number | null } | null;
  pending: Pending | null;
  lastCommandMs: number;
  last: Decision | null;
  /** The cause last stored as what keeps the plug in its state. */
  heldBy: PlugConfig["heldBy"];
  alertGeneration: number;
};

export type ControllerStats = {
  dropped: Record<string, number>;
  commandsSent: number;
  switchesLogged: number;
  acknowledged: number;
  evaluations: number;
  /** Switches and acknowledgements waiting for MariaDB (non-zero while it is unreachable). */
  switchesUnwritten: number;
  readingsUnwritten: number;
};

export type Controller = {
  mqttUrl: string;
  broker: Broker | null;
  stats: () => ControllerStats;
  /** The decision and reported state of a plug, for tests and the status line. */
  plug: (siteSlug: string, deviceId: string) => { knownOn: boolean | null; last: Decision | null; pending: boolean } | undefined;
  /** Reload configuration and evaluate everything now. */
  reload: () => Promise<void>;
  flush: () => Promise<void>;
  close: () => Promise<void>;
};


export async function createController(input: Partial<ControllerOptions> & Pick<ControllerOptions, "databaseUrl" | "controllerSecret" | "webappSecret">): Promise<Controller> {
  const options: ControllerOptions = { ...defaults, logger: pino({ name: "controller" }), ...input };
  const { logger, now } = options;
  const { db, pool } = connect(options.databaseUrl);

  const stats = { dropped: {} as Record<string, number>, commandsSent: 0, switchesLogged: 0, acknowledged: 0, evaluations: 0 };
  const drop = (reason: string, detail: Record<string, unknown>) => {
    stats.dropped[reason] = (stats.dropped[reason] ?? 0) + 1;
    logger.warn({ reason, ...detail }, "message dropped");
  };

  const switchLog: SwitchLog = createSwitchLog({ db, logger, flushMs: options.flushMs, maxBatch: 1000 });
  const store: ReadingsStore = createReadingsStore({
    db,
    logger,
    flushMs: Math.max(options.flushMs, 1000),
    maxBatch: 1000,
    maxWaiting: 200_000,
    rawRetentionMs: options.rawReadingRetentionMs,
    now,
  });
  const alerts: Alerts = createAlerts({ db, logger, now });

  // The current picture, keyed by "site/device".
  let plugsByDevice = new Map<string, PlugRuntime>();
  let sensorsByDevice = new Map<string, { id: string; siteId: string; houseId: string }>();
  let plugsBySensor = new Map<string, PlugRuntime[]>();
  const latestReading = new Map<string, { tempC: number | null; atMs: number }>();
  let startedMs = now();
  let closed = false;
  let edgeTimer: NodeJS.Timeout | undefined;
  /** Set once start-up is done; until then a reload leaves the edge timer alone. */
  let edgesArmed = false;

  async function applyConfig(config: Config) {
    const sitesById = new Map(config.sites.map((s) => [s.id, s]));
    const next = new Map<string, PlugRuntime>();
    const previous = new Map([...plugsByDevice.values()].map((r) => [r.config.id, r]));
    const unseen = config.plugs.filter((p) => !previous.has(p.id));
    const lastSwitches = new Map((await loadLastSwitches(db, unseen.map((p) => p.id))).map((s) => [s.plugId, s]));
    const schedulesOf = groupBy(config.schedules, (s) => s.plugId);
    const overridesOf = groupBy(config.overrides, (o) => o.plugId);
    for (const plug of config.plugs) {
      const site = sitesById.get(plug.siteId);
      if (!site) continue;
      const before = previous.get(plug.id);
      // A reload comes every few seconds and most schedules have not changed: keep
      // those compiled, so the edge after a reload is not held up compiling them all.
      const plugSchedules = schedulesOf.get(plug.id) ?? [];
      const scheduleKey = `${site.timeZone} ${JSON.stringify(plugSchedules)}`;
      const schedule = before?.scheduleKey === scheduleKey ? before.schedule : compilePlugSchedule(plugSchedules, site.timeZone);
      const overrides = (overridesOf.get(plug.id) ?? [])
        .map((o) => ({
          ...o,
          endsMs: o.endsAt
            ? o.endsAt.getTime()
            : o.untilNextChange
              ? (schedule.nextChangeAfter(o.startsAt.getTime()) ?? Number.POSITIVE_INFINITY)
              : Number.POSITIVE_INFINITY,
        }));
      const last = lastSwitches.get(plug.id);
      next.set(`${site.slug}/${plug.deviceId}`, {
        config: plug,
        site,
        rules: rulesOf(plug, site),
        schedule,
        scheduleKey,
        overrides,
        topic: plugTopic(site.slug, plug.deviceId, "command"),
        knownOn: before ? before.knownOn : (last?.on ?? null),
        sinceMs: before ? before.sinceMs : (last?.at.getTime() ?? 0),
        reported: before?.reported ?? null,
        pending: before?.pending ?? null,
        lastCommandMs: before?.lastCommandMs ?? 0,
        last: before?.last ?? null,
        heldBy: before ? before.heldBy : plug.heldBy,
        // Names and settings may have changed: look at alerts again on the next evaluation.
        alertGeneration: -1,
      });
    }
    plugsByDevice = next;
    sensorsByDevice = new Map(
      config.sensors.flatMap((s) => {
        const site = sitesById.get(s.siteId);
        return site ? [[`${site.slug}/${s.deviceId}`, { id: s.id, siteId: s.siteId, houseId: s.houseId }] as const] : [];
      }),
    );
    plugsBySensor = new Map();
    for (const runtime of plugsByDevice.values()) {
      const sensorId = runtime.config.sensorId;
      if (!sensorId) continue;
      const list = plugsBySensor.get(sensorId) ?? [];
      list.push(runtime);
      plugsBySensor.set(sensorId, list);
    }
  }

  async function reload() {
    const config = await loadConfig(db, new Date(now()), options.sites);
    await applyConfig(config);
    // New windows or overrides may bring the next edge closer.
    if (edgesArmed) armEdge();
    logger.info({ sites: config.sites.length, plugs: config.plugs.length, sensors: config.sensors.length }, "configuration loaded");
  }

  // Start-up: MariaDB may still be coming up; keep trying.
  for (let attempt = 0; ; attempt++) {
    try {
      await reload();
      await alerts.load();
      const startNow = now();
      for (const r of await loadLatestReadings(db, [...sensorsByDevice.values()].map((s) => s.id), new Date(startNow))) {
        // Age it by when it was taken: a restart must not make an old reading look fresh.
        latestReading.set(r.sensorId, { tempC: r.tempC, atMs: Math.min(r.at.getTime(), startNow) });
      }
      break;
    } catch (error) {
      if (attempt >= 30) throw error;
      logger.warn({ err: error, attempt }, "MariaDB not ready; retrying");
      await new Promise((resolve) => setTimeout(resolve, Math.min(5000, 200 * 2 ** attempt)));
    }
  }

  let broker: Broker | null = null;
  let mqttUrl = options.mqttUrl;
  if (!mqttUrl) {
    broker = await createBroker({
      host: options.mqttHost,
      port: options.mqttPort,
      controllerSecret: options.controllerSecret,
      webappSecret: options.webappSecret,
      lookupDeviceSecret: (username) => lookupDeviceSecret(db, username),
      logger: logger.child({ part: "broker" }),
    });
    mqttUrl = `mqtt://${options.mqttHost}:${broker.port}`;
  }

  // During a tick, commands wait here and go out a few dozen at a time between turns
  // of the event loop, so the broker (often in this process) starts delivering the
  // first while the rest are written: an edge that switches every plug then takes
  // about as long as its slowest stage, not the sum of them.
  const outbox: { topic: string; payload: string; deviceId: string }[] = [];
  let inTick = false;
  let draining = false;
  const OUTBOX_CHUNK = 50;

  function send(topic: string, payload: string, deviceId: string) {
    link.publish(topic, payload, (error) => logger.warn({ err: error, plug: deviceId }, "command publish failed; will retry"));
  }

  function drainOutbox() {
    draining = false;
    for (const command of outbox.splice(0, OUTBOX_CHUNK)) send(command.topic, command.payload, command.deviceId);
    if (outbox.length > 0 && !closed) {
      draining = true;
      setImmediate(drainOutbox);
    }
  }

  function publishCommand(runtime: PlugRuntime, pending: Pending, nowMs: number) {
    const payload = JSON.stringify({ id: pending.id, on: pending.on, lease_s: runtime.config.leaseS });
    stats.commandsSent++;
    runtime.lastCommandMs = nowMs;
    if (!inTick) return send(runtime.topic, payload, runtime.config.deviceId);
    outbox.push({ topic: runtime.topic, payload, deviceId: runtime.config.deviceId });
    if (outbox.length === OUTBOX_CHUNK && !draining) drainOutbox();
  }

  function activeOverride(runtime: PlugRuntime, nowMs: number) {
    for (const o of runtime.overrides) {
      if (o.startsAt.getTime() <= nowMs && nowMs < o.endsMs) return o;
    }
    return null;
  }

  function subjectOf(runtime: PlugRuntime) {
    return { siteId: runtime.site.id, houseId: runtime.config.houseId, plugId: runtime.config.id };
  }

  function evaluate(runtime: PlugRuntime, nowMs: number) {
    if (closed) return;
    // Until the grace has passed, a plug without a report may still have one coming.
    if (!runtime.reported && nowMs - startedMs < options.startupGraceMs) return;
    stats.evaluations++;
    const override = activeOverride(runtime, nowMs);
    const sensorId = runtime.config.sensorId;
    const reading = sensorId ? (latestReading.get(sensorId) ?? null) : null;
    const decision = decide({
      rules: runtime.rules,
      nowMs,
      reading,
      current: runtime.knownOn === null ? null : { on: runtime.knownOn, sinceMs: runtime.sinceMs },
      override: override ? { id: override.id, on: override.on } : null,
      window: runtime.schedule.activeAt(nowMs),
    });
    const last = runtime.last;
    runtime.last = decision;
    // Alerts follow what the decision says; most evaluations say what the last one did.
    if (
      last === null ||
      last.alerts !== decision.alerts ||
      last.cause !== decision.cause ||
      (last.readingTempC === null) !== (decision.readingTempC === null) ||
      runtime.alertGeneration !== alerts.generation()
    ) {
      runtime.alertGeneration = alerts.generation();
      raiseAlerts(runtime, decision);
    }

    // Whatever follows, the plug is kept in (or sent to) the wanted state, for this
    // cause; stored at once so a confirmed switch never shows the cause before it.
    if (runtime.heldBy !== decision.cause) {
      runtime.heldBy = decision.cause;
      store.heldBy(runtime.config.id, decision.cause);
    }
    const pending = runtime.pending;
    if (pending && pending.on === decision.on) return;
    const inState = runtime.knownOn === decision.on && runtime.reported?.on === decision.on;
    if (inState && !pending) {
      // Refresh the lease well before it runs out.
      if (nowMs - runtime.lastCommandMs >= (runtime.config.leaseS * 1000) / 3) {
        const refresh: Pending = { id: randomUUID(), on: decision.on, firstSentMs: nowMs, nextTryMs: nowMs + options.ackTimeoutMs, attempts: 1, isSwitch: false };
        runtime.pending = refresh;
        publishCommand(runtime, refresh, nowMs);
      }
      return;
    }
    const command: Pending = {
      id: randomUUID(),
      on: decision.on,
      firstSentMs: nowMs,
      nextTryMs: nowMs + options.ackTimeoutMs,
      attempts: 1,
      isSwitch: runtime.knownOn !== decision.on,
    };
    // A switch the plug never confirmed, now replaced: the log must not count it as
    // done. Were it carried out after all, the plug's next report shows it (resync).
    if (pending?.isSwitch) switchLog.withdraw(pending.id, new Date(nowMs));
    runtime.pending = command;
    if (command.isSwitch) {
      stats.switchesLogged++;
      switchLog.record({
        plugId: runtime.config.id,
        at: new Date(nowMs),
        fromOn: runtime.knownOn,
        toOn: decision.on,
        cause: decision.cause,
        readingTempC: decision.readingTempC,
        readingAt: reading && decision.readingTempC !== null ? new Date(reading.atMs) : null,
        userId: decision.cause === "override" ? (override?.userId ?? null) : null,
        overrideId: decision.cause === "override" ? (override?.id ?? null) : null,
        commandId: command.id,
      });
    }
    publishCommand(runtime, command, nowMs);
  }

  function raiseAlerts(runtime: PlugRuntime, decision: Decision) {
    const subject = subjectOf(runtime);
    const has = (a: string) => decision.alerts.includes(a as never);
    const sensorSubject = runtime.config.sensorId
      ? { siteId: runtime.site.id, houseId: runtime.config.houseId, sensorId: runtime.config.sensorId }
      : subject;
    if (has("sensor_quiet")) {
      const action = decision.cause === "failsafe" ? "; it is on its fail-safe" : "";
      alerts.raise("sensor_quiet", sensorSubject, `No fresh reading for ${runtime.config.name}${action}.`);
    }
    else if (runtime.config.sensorId && decision.readingTempC !== null) alerts.clear("sensor_quiet", sensorSubject);
    if (has("overload")) alerts.raise("overload", subject, `${runtime.config.name}: the appliance draws more than the plug's rating; kept off.`);
    else alerts.clear("overload", subject);
    if (has("too_hot")) alerts.raise("too_hot", subject, `${runtime.config.name}: at or above the house's high limit; heater kept off.`);
    else alerts.clear("too_hot", subject);
  }

  function onReport(runtime: PlugRuntime, payload: Buffer, nowMs: number) {
    const decoded = decode(reportPayload, payload);
    if (!decoded.ok) return drop("bad_report", { plug: runtime.config.deviceId, error: decoded.error });
    const report = decoded.value;
    runtime.reported = { on: report.on, cmd: report.cmd ?? null, atMs: nowMs, watts: report.watts ?? null, wh: report.wh ?? null };
    store.seen("plugs", runtime.config.id, true, new Date(nowMs));

    const pending = runtime.pending;
    if (pending && report.cmd === pending.id && report.on === pending.on) {
      stats.acknowledged++;
      runtime.pending = null;
      if (pending.isSwitch) {
        switchLog.acknowledge(pending.id, new Date(nowMs), nowMs - pending.firstSentMs);
        runtime.knownOn = pending.on;
        runtime.sinceMs = nowMs;
      }
      alerts.clear("plug_unanswered", subjectOf(runtime));
    } else if (report.on !== runtime.knownOn) {
      // The plug is not in the state the log says: it fell back on its own (no
      // command id) or the log missed a switch (e.g. across a restart). Record it
      // so runtime stays true.
      if (pending?.isSwitch) {
        // It got where a switch still in flight was taking it, but not by that
        // command: that switch did not happen. The command still goes out, to put
        // the plug under a lease again.
        switchLog.withdraw(pending.id, new Date(nowMs));
        pending.isSwitch = false;
      }
      const id = `observed-${randomUUID()}`;
      stats.switchesLogged++;
      switchLog.record({
        plugId: runtime.config.id,
        at: new Date(nowMs),
        fromOn: runtime.knownOn,
        toOn: report.on,
        cause: report.cmd ? "resync" : "failsafe",
        commandId: id,
        ackAt: new Date(nowMs),
        latencyMs: 0,
      });
      runtime.knownOn = report.on;
      runtime.sinceMs = nowMs;
    }
    evaluate(runtime, nowMs);
  }

  function onReading(key: string, payload: Buffer, nowMs: number) {
    const sensor = sensorsByDevice.get(key);
    if (!sensor) return drop("unknown_sensor", { device: key });
    const decoded = decode(readingPayload, payload);
    if (!decoded.ok) return drop("bad_reading", { sensor: key, error: decoded.error });
    const r = decoded.value;
    // Staleness is judged by when the reading arrived, not by the sensor's own clock;
    // the stored time is the sensor's unless that clock is clearly off.
    const claimed = Date.parse(r.at);
    const at = Math.abs(claimed - nowMs) <= 5 * 60_000 ? claimed : nowMs;
    latestReading.set(sensor.id, { tempC: r.temp_c, atMs: nowMs });
    store.add({ sensorId: sensor.id, at: new Date(at), tempC: r.temp_c, rh: r.rh ?? null, battery: r.battery ?? null });
    store.seen("sensors", sensor.id, true, new Date(nowMs));
    for (const runtime of plugsBySensor.get(sensor.id) ?? []) evaluate(runtime, nowMs);
  }

  let reloadTimer: NodeJS.Timeout | undefined;
  function scheduleReload() {
    if (reloadTimer) return;
    reloadTimer = setTimeout(() => {
      reloadTimer = undefined;
      reload()
        .then(() => tick())
        .catch((error: unknown) => logger.error({ err: error }, "configuration reload failed; keeping the last one"));
    }, 50);
  }

  function onMessage(topic: string, payload: Buffer) {
    const nowMs = now();
    const parsed = parseTopic(topic);
    if (!parsed) return drop("unknown_topic", { topic });
    if (parsed.kind === "controller") {
      const decoded = decode(wakePayload, payload);
      if (!decoded.ok) return drop("bad_wake", { topic, error: decoded.error });
      return scheduleReload();
    }
    const key = `${parsed.site}/${parsed.device}`;
    if (parsed.kind === "sensor") return onReading(key, payload, nowMs);
    const runtime = plugsByDevice.get(key);
    if (!runtime) return drop("unknown_plug", { device: key });
    if (parsed.channel === "report") return onReport(runtime, payload, nowMs);
    if (parsed.channel === "presence") {
      const decoded = decode(presencePayload, payload);
      if (!decoded.ok) return drop("bad_presence", { plug: key, error: decoded.error });
      store.seen("plugs", runtime.config.id, decoded.value === "online", new Date(nowMs));
      if (decoded.value === "offline") runtime.reported = null;
    }
    // Commands are ours; hearing them back is expected and ignored.
  }

  function retry(runtime: PlugRuntime, nowMs: number) {
    const pending = runtime.pending;
    if (!pending || nowMs < pending.nextTryMs) return;
    pending.attempts++;
    pending.nextTryMs = nowMs + Math.min(options.maxRetryMs, options.ackTimeoutMs * 2 ** (pending.attempts - 1));
    if (pending.attempts === options.unansweredAfter) {
      alerts.raise("plug_unanswered", subjectOf(runtime), `${runtime.config.name} has not answered ${pending.attempts} commands.`, {
        commandId: pending.id,
      });
    }
    publishCommand(runtime, pending, nowMs);
  }

  function tick() {
    const nowMs = now();
    inTick = true;
    try {
      for (const runtime of plugsByDevice.values()) {
        retry(runtime, nowMs);
        evaluate(runtime, nowMs);
      }
    } finally {
      inTick = false;
    }
    if (!draining) drainOutbox();
  }

  // Schedule edges: wake exactly when the next window opens or closes, so a change
  // does not wait for the backstop tick.
  function armEdge() {
    clearTimeout(edgeTimer);
    if (closed) return;
    const nowMs = now();
    let next = Number.POSITIVE_INFINITY;
    for (const runtime of plugsByDevice.values()) {
      const edge = runtime.schedule.nextChangeAfter(nowMs);
      if (edge !== null && edge < next) next = edge;
      for (const o of runtime.overrides) if (o.endsMs > nowMs && o.endsMs < next) next = o.endsMs;
    }
    // Measured after the loop: compiling schedules afresh (after a reload) takes a while.
    const delay = Math.min(Math.max(0, next - now()), options.tickMs * 60);
    edgeTimer = setTimeout(() => {
      tick();
      armEdge();
    }, delay);
    edgeTimer.unref?.();
  }

  const linkOptions = {
    subscriptions: [
      `${TOPIC_ROOT}/+/plug/+/report`,
      `${TOPIC_ROOT}/+/plug/+/presence`,
      `${TOPIC_ROOT}/+/sensor/+/reading`,
      `${TOPIC_ROOT}/+/controller/wake`,
    ],
    onMessage(topic: string, payload: Buffer) {
      try {
        onMessage(topic, payload);
      } catch (error) {
        drop("handler_error", { topic, err: error });
      }
    },
    logger: logger.child({ part: "link" }),
  };
  // Its own broker it reaches in-process; an external one over the network.
  const link: BrokerLink = broker
    ? await broker.link(linkOptions)
    : connectNetworkLink({ ...linkOptions, url: mqttUrl, username: CONTROLLER_USERNAME, password: options.controllerSecret });

  startedMs = now();
  const tickTimer = setInterval(tick, options.tickMs);
  const reloadInterval = setInterval(scheduleReload, options.configReloadMs);
  edgesArmed = true;
  armEdge();

  let closing: Promise<void> | undefined;
  return {
    mqttUrl,
    broker,
    stats: () => ({ ...stats, switchesUnwritten: switchLog.waiting(), readingsUnwritten: store.waiting() }),
    plug(siteSlug, deviceId) {
      const r = plugsByDevice.get(`${siteSlug}/${deviceId}`);
      return r && { knownOn: r.knownOn, last: r.last, pending: r.pending !== null };
    },
    reload: async () => {
      await reload();
      tick();
    },
    flush: async () => {
      await switchLog.flush();
      await store.flush();
    },
    close: () =>
      (closing ??= (async () => {
        closed = true;
        clearInterval(tickTimer);
        clearInterval(reloadInterval);
        clearTimeout(edgeTimer);
        clearTimeout(reloadTimer);
        await link.close();
        await switchLog.close();
        await store.close();
        await broker?.close();
        await pool.end();
        logger.info("controller stopped");
      })()),
  };
}

export type { Database };
