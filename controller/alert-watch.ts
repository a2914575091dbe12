// The rule-based alerts (lib/alerts/evaluate.ts) kept running: the condition states of
// every sensor and plug, fed by the inbox (readings, reports, presence) and the tick,
// and the changes carried to alerts.ts, which stores them off the control path.
//
// Sensor silence is one alert per sensor shared with the decision's quiet-sensor
// fail-safe (alert-wording.ts): whichever notices first raises it (the decision after
// the plug's staleAfterS, this room after the house's sensorSilent.afterMin), and only a
// reading with a temperature closes it, here. The decision never closes it, so the two
// cannot undo each other: a sensor that sends readings without a temperature stays
// "silent" for both.
//
// The open/closed part of each condition follows alerts.ts: at start-up, and whenever
// its open set changes other than by raise/clear (a failed write), the states are set
// again from it, so an alert left open by an earlier run is closed by recovery here.
import type { Logger } from "pino";
import { CLOSED, openedAt, type ConditionState } from "@/lib/alerts/conditions";
import {
  PLUG_CLOSED,
  SENSOR_CLOSED,
  evaluatePlug,
  evaluateReading,
  silenceCheck,
  silenceEnded,
  type AlertChange,
  type PlugConditions,
  type PlugObservation,
  type SensorConditions,
} from "@/lib/alerts/evaluate";
import type { AlertKind, AlertSubject, Alerts } from "./alerts";
import type { LatestReading, PlugRuntime, Registry, SensorRuntime } from "./registry";

type SensorWatch = { conditions: SensorConditions; lastHeardMs: number; subject: AlertSubject; generation: number };
type PlugWatch = {
  conditions: PlugConditions;
  lastHeardMs: number;
  offlineSinceMs: number | null;
  commandedOn: boolean | null;
  commandedSinceMs: number;
  subject: AlertSubject;
  generation: number;
};

export type AlertWatchOptions = {
  alerts: Alerts;
  registry: Registry;
  logger: Logger;
  /** A command within this of being sent is on its way, not "not as commanded". */
  ackTimeoutMs: number;
  /** The time-based rules are looked at this often (their limits are minutes). */
  everyMs: number;
  now: () => number;
};

function synced(state: ConditionState, isOpen: boolean): ConditionState {
  if (state.open === isOpen) return state;
  return isOpen ? openedAt(null) : CLOSED;
}

export function createAlertWatch(options: AlertWatchOptions) {
  const { alerts, registry, logger } = options;
  const startedMs = options.now();
  const sensors = new Map<string, SensorWatch>();
  const plugs = new Map<string, PlugWatch>();
  let lastPassMs = Number.NEGATIVE_INFINITY;

  function carry(change: AlertChange, subject: AlertSubject) {
    if (change.change === "raise") alerts.raise(change.kind, subject, change.message, change.detail);
    else alerts.clear(change.kind, subject, change.message, change.cleared);
  }

  function sensorWatch(sensor: SensorRuntime): SensorWatch {
    let w = sensors.get(sensor.id);
    if (!w) {
      const latest = registry.reading(sensor.id);
      // Silence counts from this start at the earliest: while the controller was down nobody
      // listened (that gap is the "control stopped" alert's), so each sensor gets its full
      // limit to be heard again before it is called silent.
      const heardMs = latest && latest.tempC !== null ? Math.max(latest.atMs, startedMs) : startedMs;
      w = { conditions: SENSOR_CLOSED, lastHeardMs: heardMs, subject: { siteId: sensor.siteId, houseId: sensor.houseId, sensorId: sensor.id }, generation: -1 };
      sensors.set(sensor.id, w);
    }
    if (w.generation !== alerts.generation()) {
      w.generation = alerts.generation();
      const open = (kind: AlertKind) => alerts.isOpen(kind, w!.subject);
      const c = w.conditions;
      const condensation = open("condensation");
      const same = condensation === (c.dew.open || c.humid.open);
      w.conditions = {
        frost: synced(c.frost, open("too_cold")),
        warm: synced(c.warm, open("too_warm")),
        battery: synced(c.battery, open("battery_low")),
        // Which of the two opened a stored alert is not known here: take the dew point's.
        dew: same ? c.dew : synced(c.dew, condensation),
        humid: same ? c.humid : CLOSED,
      };
    }
    return w;
  }

  function plugWatch(runtime: PlugRuntime, nowMs: number): PlugWatch {
    let w = plugs.get(runtime.config.id);
    if (!w) {
      w = {
        conditions: PLUG_CLOSED,
        lastHeardMs: Math.max(startedMs, runtime.switching.reported?.atMs ?? startedMs),
        offlineSinceMs: null,
        commandedOn: runtime.last?.on ?? null,
        commandedSinceMs: nowMs,
        subject: { siteId: runtime.site.id, houseId: runtime.config.houseId, plugId: runtime.config.id },
        generation: -1,
      };
      plugs.set(runtime.config.id, w);
    }
    if (w.generation !== alerts.generation()) {
      w.generation = alerts.generation();
      const open = (kind: AlertKind) => alerts.isOpen(kind, w!.subject);
      const c = w.conditions;
      w.conditions = { offline: synced(c.offline, open("plug_offline")), mismatch: synced(c.mismatch, open("plug_mismatch")), longOn: synced(c.longOn, open("heater_long_on")) };
    }
    return w;
  }

  function evaluateSensor(sensor: SensorRuntime, reading: LatestReading, nowMs: number) {
    const w = sensorWatch(sensor);
    // Sensors send 0..1; 0.07 × 100 is 7.000000000000001, so keep a tenth of a point.
    const batteryPercent = reading.battery === null ? null : Math.round(reading.battery * 1000) / 10;
    const result = evaluateReading(w.conditions, sensor.alert, { tempC: reading.tempC, rh: reading.rh, batteryPercent }, nowMs);
    w.conditions = result.conditions;
    for (const change of result.changes) carry(change, w.subject);
    return w;
  }

  // One scratch observation: the tick looks at every plug and allocates nothing for most.
  const seen: PlugObservation = { offlineSinceMs: null, lastHeardMs: 0, reportedOn: null, commandedOn: null, commandedSinceMs: 0, on: null, onSinceMs: 0 };

  function pass(nowMs: number) {
    for (const sensor of registry.sensors()) {
      const w = sensorWatch(sensor);
      const silent = silenceCheck(sensor.alert, w.lastHeardMs, nowMs);
      if (silent) carry(silent, w.subject);
    }
    for (const runtime of registry.plugs()) {
      const w = plugWatch(runtime, nowMs);
      const commanded = runtime.last?.on ?? null;
      if (commanded !== w.commandedOn) {
        w.commandedOn = commanded;
        w.commandedSinceMs = nowMs;
      }
      const s = runtime.switching;
      seen.offlineSinceMs = w.offlineSinceMs;
      seen.lastHeardMs = w.lastHeardMs;
      seen.reportedOn = s.reported?.on ?? null;
      seen.commandedOn = commanded;
      seen.commandedSinceMs = w.commandedSinceMs;
      seen.on = s.on;
      seen.onSinceMs = s.sinceMs;
      const result = evaluatePlug(w.conditions, runtime.alert, seen, nowMs, options.ackTimeoutMs);
      w.conditions = result.conditions;
      for (const change of result.changes) carry(change, w.subject);
    }
  }

  /** Never lets a fault here reach the control path. */
  function guarded(what: string, work: () => void) {
    try {
      work();
    } catch (error) {
      logger.error({ err: error, what }, "alert rules failed; control carries on");
    }
  }

  return {
    /** A sensor's reading, after the plugs following it have been decided on. */
    reading(sensor: SensorRuntime, reading: LatestReading, nowMs: number) {
      guarded("reading", () => {
        const w = evaluateSensor(sensor, reading, nowMs);
        if (reading.tempC === null) return;
        w.lastHeardMs = nowMs;
        if (alerts.isOpen("sensor_quiet", w.subject)) carry(silenceEnded(sensor.alert, { tempC: reading.tempC, rh: reading.rh, batteryPercent: null }, nowMs), w.subject);
      });
    },
    /** A plug's report: it is there. */
    heard(runtime: PlugRuntime, nowMs: number) {
      guarded("report", () => {
        const w = plugWatch(runtime, nowMs);
        w.lastHeardMs = nowMs;
        w.offlineSinceMs = null;
      });
    },
    presence(runtime: PlugRuntime, online: boolean, nowMs: number) {
      guarded("presence", () => {
        const w = plugWatch(runtime, nowMs);
        if (online) {
          w.lastHeardMs = nowMs;
          w.offlineSinceMs = null;
        } else w.offlineSinceMs ??= nowMs;
      });
    },
    /** The controller's tick; the time-based rules run every `everyMs`. */
    tick(nowMs: number) {
      if (nowMs - lastPassMs < options.everyMs) return;
      lastPassMs = nowMs;
      guarded("tick", () => pass(nowMs));
    },
    /**
     * After a reload: forget devices that left, take each fresh latest reading through
     * the new rules at once, and look at the time-based rules on the next tick.
     */
    reloaded(nowMs: number) {
      guarded("reload", () => {
        const sensorIds = new Set<string>();
        for (const sensor of registry.sensors()) {
          sensorIds.add(sensor.id);
          const latest = registry.reading(sensor.id);
          const silentAfterMs = sensor.alert.house.rules.sensorSilent.afterMin * 60_000;
          if (latest && nowMs - latest.atMs < silentAfterMs) evaluateSensor(sensor, latest, nowMs);
        }
        for (const id of sensors.keys()) if (!sensorIds.has(id)) sensors.delete(id);
        const plugIds = new Set<string>();
        for (const runtime of registry.plugs()) plugIds.add(runtime.config.id);
        for (const id of plugs.keys()) if (!plugIds.has(id)) plugs.delete(id);
        lastPassMs = Number.NEGATIVE_INFINITY;
      });
    },
  };
}

export type AlertWatch = ReturnType<typeof createAlertWatch>;
