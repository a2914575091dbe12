// The switch lifecycle of one plug: (state, event, now) → (new state, effects).
//
// A decision asks for a state; when the plug is not in it a command goes out with an
// id and a lease, and a change of state is recorded in the switch log at once. The
// switch counts as done when the plug's report echoes the id. A switch replaced
// before the plug confirmed it is withdrawn. A plug found in another state than the
// log says (it fell back by itself, or carried out a command the controller no longer
// knows) is recorded as observed. Unanswered commands are sent again with back-off;
// a plug in its state is sent its command again before the lease runs out.
//
// The controller applies the effects (publish, switch log, alerts, stored state) and
// does nothing else with a plug's switching. Invariants, held by the property tests:
//   - a plug's log is a chain: each kept row's `from` is the previous kept row's `to`;
//   - each switch is recorded once, and acknowledged or withdrawn at most once;
//   - a withdrawn switch is never taken as the plug's state;
//   - a command is sent again before its lease runs out;
//   - every command follows the latest decision (so no "on" goes out when the
//     decision says off, e.g. at or above the house's high limit).
import type { SwitchCause } from "../domain";
import type { Decision } from "./types";

/** A command in flight: sent, not yet echoed. `isSwitch`: it changes the plug's state (and is in the log). */
export type Command = {
  id: string;
  on: boolean;
  firstSentMs: number;
  nextTryMs: number;
  attempts: number;
  isSwitch: boolean;
};

export type PlugSwitchState = {
  /** The end of the log's chain: where the last kept, confirmed switch took the plug. Null before the first. */
  on: boolean | null;
  sinceMs: number;
  /** The command id of that switch (null when nothing is logged yet). */
  switchId: string | null;
  command: Command | null;
  /** The plug's last report, as heard; null while it is offline or not heard since start. */
  reported: { on: boolean; cmd: string | null; atMs: number } | null;
  /** The plug's own time on its newest report: older reports arriving later are stale. */
  newestReportMs: number | null;
  lastSentMs: number;
  /** Why the plug is kept as it is now: the latest decision's cause. */
  presentCause: SwitchCause | null;
  /** When the anti-short-cycle guard lets the wanted change through. */
  guardUntilMs: number | null;
  /** A plug-not-answering alert is open. */
  unanswered: boolean;
};

export type LifecycleSettings = {
  leaseS: number;
  ackTimeoutMs: number;
  maxRetryMs: number;
  /** Unanswered sends of one command before the alert. */
  unansweredAfter: number;
};

/** What the decision was made from, for the log row. */
export type DecisionContext = { readingAtMs: number | null; userId: string | null; overrideId: string | null };

export type SwitchEvent =
  | { type: "decision"; decision: Decision; context: DecisionContext }
  | { type: "report"; on: boolean; cmd: string | null; plugTimeMs: number }
  | { type: "presence"; online: boolean }
  /** The retry and lease-refresh timer (the controller's tick). */
  | { type: "timer" };

export type SwitchRecord = {
  commandId: string;
  atMs: number;
  fromOn: boolean | null;
  toOn: boolean;
  cause: SwitchCause;
  readingTempC: number | null;
  readingAtMs: number | null;
  userId: string | null;
  overrideId: string | null;
  /** Set for an observed change: it is done when it is recorded. */
  ackAtMs: number | null;
};

export type SwitchEffect =
  | { type: "send"; id: string; on: boolean }
  | { type: "record"; row: SwitchRecord }
  | { type: "acknowledge"; commandId: string; atMs: number; latencyMs: number }
  | { type: "withdraw"; commandId: string; atMs: number }
  | { type: "raise_unanswered"; commandId: string; attempts: number }
  | { type: "clear_unanswered" }
  /** A report older than one already heard; nothing was changed. */
  | { type: "stale_report" }
  /** Something the stored present state holds has changed. */
  | { type: "store" };

export type Transition = { state: PlugSwitchState; effects: readonly SwitchEffect[] };

/** The present state as stored (plug_states), from which a restarted controller carries on. */
export type StoredSwitchState = {
  on: boolean | null;
  sinceMs: number | null;
  switchId: string | null;
  pending: { id: string; on: boolean; sinceMs: number } | null;
  presentCause: SwitchCause | null;
  /** The plug's own time on its newest report heard. */
  newestReportMs: number | null;
};

const NONE: readonly SwitchEffect[] = Object.freeze([]);

/** A report this much older than the newest one is taken as the plug's clock set back, not a late copy. */
const CLOCK_SET_BACK_MS = 10 * 60_000;

/** Where a restarted controller starts: the stored end of the chain, and a switch that was on its way. */
export function restoredState(stored: StoredSwitchState | null, nowMs: number): PlugSwitchState {
  const pending = stored?.pending;
  return {
    on: stored?.on ?? null,
    sinceMs: stored?.sinceMs ?? 0,
    switchId: stored?.switchId ?? null,
    // Still unconfirmed: send it again (same id) at the first chance, or withdraw it if
    // the first decision wants otherwise. A late echo of it still completes it.
    command: pending ? { id: pending.id, on: pending.on, firstSentMs: pending.sinceMs, nextTryMs: nowMs, attempts: 1, isSwitch: true } : null,
    reported: null,
    newestReportMs: stored?.newestReportMs ?? null,
    lastSentMs: 0,
    presentCause: stored?.presentCause ?? null,
    guardUntilMs: null,
    unanswered: false,
  };
}

export function stepSwitch(state: PlugSwitchState, event: SwitchEvent, nowMs: number, settings: LifecycleSettings, newId: () => string): Transition {
  switch (event.type) {
    case "decision":
      return onDecision(state, event.decision, event.context, nowMs, settings, newId);
    case "report":
      return onReport(state, event, nowMs, newId);
    case "presence":
      return event.online || state.reported === null ? { state, effects: NONE } : { state: { ...state, reported: null }, effects: NONE };
    case "timer":
      return onTimer(state, nowMs, settings, newId);
  }
}

function onDecision(s: PlugSwitchState, d: Decision, context: DecisionContext, nowMs: number, settings: LifecycleSettings, newId: () => string): Transition {
  let next = s;
  let effects: SwitchEffect[] | null = null;
  if (s.presentCause !== d.cause || s.guardUntilMs !== d.guardUntilMs) {
    next = { ...s, presentCause: d.cause, guardUntilMs: d.guardUntilMs };
    effects = [{ type: "store" }];
  }
  const inFlight = s.command;
  if (inFlight && inFlight.on === d.on) return { state: next, effects: effects ?? NONE };
  if (!inFlight && s.on === d.on && s.reported?.on === d.on) return { state: next, effects: effects ?? NONE };

  effects ??= [{ type: "store" }];
  const command: Command = {
    id: newId(),
    on: d.on,
    firstSentMs: nowMs,
    nextTryMs: nowMs + settings.ackTimeoutMs,
    attempts: 1,
    isSwitch: s.on !== d.on,
  };
  // A switch the plug never confirmed, now replaced: the log must not count it as
  // done. Were it carried out after all, the plug's next report shows it (observed).
  if (inFlight?.isSwitch) effects.push({ type: "withdraw", commandId: inFlight.id, atMs: nowMs });
  if (command.isSwitch) {
    const byOverride = d.cause === "override";
    effects.push({
      type: "record",
      row: {
        commandId: command.id,
        atMs: nowMs,
        fromOn: s.on,
        toOn: d.on,
        cause: d.cause,
        readingTempC: d.readingTempC,
        readingAtMs: d.readingTempC === null ? null : context.readingAtMs,
        userId: byOverride ? context.userId : null,
        overrideId: byOverride ? context.overrideId : null,
        ackAtMs: null,
      },
    });
  }
  effects.push({ type: "send", id: command.id, on: command.on });
  return { state: { ...next, command, lastSentMs: nowMs }, effects };
}

function onReport(s: PlugSwitchState, r: Extract<SwitchEvent, { type: "report" }>, nowMs: number, newId: () => string): Transition {
  // A copy of an older report (redelivered, or overtaken on the way) says nothing new
  // and must not be taken for a change.
  if (s.newestReportMs !== null && r.plugTimeMs < s.newestReportMs && s.newestReportMs - r.plugTimeMs < CLOCK_SET_BACK_MS) {
    return { state: s, effects: [{ type: "stale_report" }] };
  }
  const heard: PlugSwitchState = { ...s, reported: { on: r.on, cmd: r.cmd, atMs: nowMs }, newestReportMs: r.plugTimeMs };
  const command = s.command;

  if (command && r.cmd === command.id && r.on === command.on) {
    const effects: SwitchEffect[] = [];
    let next: PlugSwitchState = { ...heard, command: null, unanswered: false };
    if (command.isSwitch) {
      effects.push({ type: "acknowledge", commandId: command.id, atMs: nowMs, latencyMs: nowMs - command.firstSentMs }, { type: "store" });
      next = { ...next, on: command.on, sinceMs: nowMs, switchId: command.id };
    }
    if (s.unanswered) effects.push({ type: "clear_unanswered" });
    return { state: next, effects };
  }

  if (r.on === s.on) return { state: heard, effects: NONE };

  // The plug is not where the log says: it fell back by itself (no command id) or
  // carried out a command the controller no longer counts on. Record it, so runtime
  // stays true.
  // A switch in flight did not happen as logged: the plug got where it is without it.
  // If it was going there too, the command still goes out, to put the plug under a
  // lease again. Any other command would now be a switch nobody logged: drop it, and
  // let the next decision send (and log) what it wants.
  const effects: SwitchEffect[] = [];
  if (command?.isSwitch) effects.push({ type: "withdraw", commandId: command.id, atMs: nowMs });
  const stillInFlight: Command | null = command && command.on === r.on ? { ...command, isSwitch: false } : null;
  const id = `observed-${newId()}`;
  effects.push(
    {
      type: "record",
      row: {
        commandId: id,
        atMs: nowMs,
        fromOn: s.on,
        toOn: r.on,
        cause: r.cmd ? "resync" : "plug_fallback",
        readingTempC: null,
        readingAtMs: null,
        userId: null,
        overrideId: null,
        ackAtMs: nowMs,
      },
    },
    { type: "store" },
  );
  return { state: { ...heard, on: r.on, sinceMs: nowMs, switchId: id, command: stillInFlight }, effects };
}

function onTimer(s: PlugSwitchState, nowMs: number, settings: LifecycleSettings, newId: () => string): Transition {
  const leaseThirdMs = (settings.leaseS * 1000) / 3;
  const command = s.command;
  if (command) {
    if (nowMs < command.nextTryMs) return { state: s, effects: NONE };
    const attempts = command.attempts + 1;
    // Back off, but never past a third of the lease: the plug must hear it in time.
    const wait = Math.min(settings.maxRetryMs, leaseThirdMs, settings.ackTimeoutMs * 2 ** (attempts - 1));
    const effects: SwitchEffect[] = [{ type: "send", id: command.id, on: command.on }];
    let unanswered = s.unanswered;
    if (attempts >= settings.unansweredAfter && !unanswered) {
      effects.push({ type: "raise_unanswered", commandId: command.id, attempts });
      unanswered = true;
    }
    return { state: { ...s, command: { ...command, attempts, nextTryMs: nowMs + wait }, lastSentMs: nowMs, unanswered }, effects };
  }
  // In its state: send the same again well before the lease runs out.
  if (s.on !== null && s.reported?.on === s.on && nowMs - s.lastSentMs >= leaseThirdMs) {
    const refresh: Command = { id: newId(), on: s.on, firstSentMs: nowMs, nextTryMs: nowMs + settings.ackTimeoutMs, attempts: 1, isSwitch: false };
    return { state: { ...s, command: refresh, lastSentMs: nowMs }, effects: [{ type: "send", id: refresh.id, on: refresh.on }] };
  }
  return { state: s, effects: NONE };
}
