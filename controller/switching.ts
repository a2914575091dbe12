// Carries events into each plug's switch lifecycle (lib/control/switch-lifecycle.ts)
// and its effects out: commands to the outbox, rows to the switch log, the present
// state to plug_states, alerts. Nothing here decides anything.
import { randomUUID } from "node:crypto";
import { decide, type Decision } from "@/lib/control";
import { stepSwitch, type LifecycleSettings, type PlugSwitchState, type SwitchEffect, type SwitchEvent } from "@/lib/control/switch-lifecycle";
import type { Alerts } from "./alerts";
import { clearUnanswered, followDecisionAlerts, raiseUnanswered } from "./alert-wording";
import type { Outbox } from "./outbox";
import type { PlugRuntime, Registry } from "./registry";
import type { SwitchLog } from "./switch-log";

export type SwitchingOptions = {
  registry: Registry;
  outbox: Outbox;
  switchLog: SwitchLog;
  alerts: Alerts;
  settings: Omit<LifecycleSettings, "leaseS">;
  /** Until then a plug that has not reported may still have a report coming: it is not decided on. */
  graceEndsMs: () => number;
  onStaleReport: (runtime: PlugRuntime) => void;
};

const at = (ms: number | null) => (ms === null ? null : new Date(ms));

export function createSwitching(options: SwitchingOptions) {
  const { registry, outbox, switchLog, alerts } = options;
  const stats = { commandsSent: 0, switchesLogged: 0, acknowledged: 0, evaluations: 0 };

  function activeOverride(runtime: PlugRuntime, nowMs: number) {
    for (const o of runtime.overrides) if (o.startsAt.getTime() <= nowMs && nowMs < o.endsMs) return o;
    return null;
  }

  // One settings object per lease length: the hot path allocates none.
  const settingsByLease = new Map<number, LifecycleSettings>();
  function settingsFor(leaseS: number) {
    let settings = settingsByLease.get(leaseS);
    if (!settings) settingsByLease.set(leaseS, (settings = { ...options.settings, leaseS }));
    return settings;
  }

  function apply(runtime: PlugRuntime, event: SwitchEvent, nowMs: number): readonly SwitchEffect[] {
    const { state, effects } = stepSwitch(runtime.switching, event, nowMs, settingsFor(runtime.config.leaseS), randomUUID);
    runtime.switching = state;
    for (const effect of effects) carryOut(runtime, effect, state);
    return effects;
  }

  function carryOut(runtime: PlugRuntime, effect: SwitchEffect, state: PlugSwitchState) {
    switch (effect.type) {
      case "send":
        stats.commandsSent++;
        outbox.publish(runtime.topic, JSON.stringify({ id: effect.id, on: effect.on, lease_s: runtime.config.leaseS }), runtime.config.deviceId);
        return;
      case "record": {
        const row = effect.row;
        stats.switchesLogged++;
        switchLog.record({
          plugId: runtime.config.id,
          commandId: row.commandId,
          at: new Date(row.atMs),
          fromOn: row.fromOn,
          toOn: row.toOn,
          cause: row.cause,
          ratedWatts: runtime.config.applianceWatts,
          readingTempC: row.readingTempC,
          readingAt: at(row.readingAtMs),
          userId: row.userId,
          overrideId: row.overrideId,
          ackAt: at(row.ackAtMs),
          latencyMs: row.ackAtMs === null ? null : 0,
        });
        return;
      }
      case "acknowledge":
        stats.acknowledged++;
        switchLog.acknowledge(effect.commandId, new Date(effect.atMs), effect.latencyMs);
        return;
      case "withdraw":
        switchLog.withdraw(effect.commandId, new Date(effect.atMs));
        return;
      case "raise_unanswered":
        raiseUnanswered(alerts, runtime, effect.attempts, effect.commandId);
        return;
      case "clear_unanswered":
        clearUnanswered(alerts, runtime);
        return;
      case "stale_report":
        options.onStaleReport(runtime);
        return;
      case "store": {
        const pending = state.command?.isSwitch ? state.command : null;
        switchLog.present(runtime.config.id, {
          on: state.on,
          since: state.on === null ? null : new Date(state.sinceMs),
          switchCommandId: state.switchId,
          presentCause: state.presentCause,
          pendingOn: pending?.on ?? null,
          pendingCommandId: pending?.id ?? null,
          pendingSince: pending ? new Date(pending.firstSentMs) : null,
          guardUntil: at(state.guardUntilMs),
        });
        return;
      }
    }
  }

  /** Decides the plug's state now and acts on it. */
  function evaluate(runtime: PlugRuntime, nowMs: number) {
    if (!runtime.switching.reported && nowMs < options.graceEndsMs()) return;
    stats.evaluations++;
    const override = activeOverride(runtime, nowMs);
    const sensorId = runtime.config.sensorId;
    const reading = sensorId ? registry.reading(sensorId) : null;
    const s = runtime.switching;
    const decision = decide({
      rules: runtime.rules,
      nowMs,
      reading,
      current: s.on === null ? null : { on: s.on, sinceMs: s.sinceMs },
      override: override ? { id: override.id, on: override.on } : null,
      window: runtime.schedule.activeAt(nowMs),
    });
    followAlerts(runtime, decision);
    apply(runtime, { type: "decision", decision, context: { readingAtMs: reading?.atMs ?? null, userId: override?.userId ?? null, overrideId: override?.id ?? null } }, nowMs);
  }

  // Most evaluations say what the last one did: look at alerts only when that changes.
  function followAlerts(runtime: PlugRuntime, decision: Decision) {
    const last = runtime.last;
    runtime.last = decision;
    if (
      last === null ||
      last.alerts !== decision.alerts ||
      last.cause !== decision.cause ||
      (last.readingTempC === null) !== (decision.readingTempC === null) ||
      runtime.alertGeneration !== alerts.generation()
    ) {
      runtime.alertGeneration = alerts.generation();
      followDecisionAlerts(alerts, runtime, decision);
    }
  }

  return {
    evaluate,
    /** Takes in a plug's report; false when it was older than one already heard (stale, ignored). */
    report(runtime: PlugRuntime, report: { on: boolean; cmd: string | null; plugTimeMs: number }, nowMs: number): boolean {
      const effects = apply(runtime, { type: "report", ...report }, nowMs);
      evaluate(runtime, nowMs);
      return !effects.some((effect) => effect.type === "stale_report");
    },
    presence(runtime: PlugRuntime, online: boolean, nowMs: number) {
      apply(runtime, { type: "presence", online }, nowMs);
    },
    /** Retries and lease refreshes, after the plug has been decided on. */
    timer(runtime: PlugRuntime, nowMs: number) {
      if (!runtime.switching.reported && nowMs < options.graceEndsMs()) return;
      apply(runtime, { type: "timer" }, nowMs);
    },
    stats: () => ({ ...stats }),
  };
}

export type Switching = ReturnType<typeof createSwitching>;
