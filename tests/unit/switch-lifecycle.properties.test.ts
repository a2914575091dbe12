// Property tests of the switch lifecycle: a simulated plug on a faulty network
// (commands and reports lost, duplicated, delayed and overtaken), random readings
// (some at or above the house's high limit), a quiet sensor now and then, and
// controller restarts that carry on from the stored state. After every step the log
// the effects build must hold the lifecycle's invariants.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { decide, sharedRules, type Decision, type PlugRules } from "@/lib/control";
import {
  restoredState,
  stepSwitch,
  type LifecycleSettings,
  type PlugSwitchState,
  type StoredSwitchState,
  type SwitchEffect,
} from "@/lib/control/switch-lifecycle";

const HIGH_LIMIT_C = 30;
const STALE_AFTER_S = 60;
const TICK_MS = 1000;

const rules: PlugRules = sharedRules({
  applianceKind: "heater",
  applianceWatts: 2000,
  ratedCurrentA: 13,
  mainsVoltage: 230,
  continuousLoadPercent: 80,
  highLimitC: HIGH_LIMIT_C,
  failsafe: "on",
  failsafeDutyPercent: null,
  failsafeDutyPeriodS: 1200,
  staleAfterS: STALE_AFTER_S,
  outsideWindows: "off",
  frostLowC: null,
  frostHighC: null,
  minOnS: 30,
  minOffS: 30,
});
const window = { window: { mode: "band" as const, lowC: 10, highC: 12 } };

type Row = { commandId: string; fromOn: boolean | null; toOn: boolean; acked: boolean; withdrawn: boolean; atMs: number; ackAtMs: number | null; confirmedByPlugAtMs: number | null };
type Message<T> = T & { deliverAtMs: number; seq: number };
type Faults = { lose: number; duplicate: number; maxDelayMs: number };

type Step =
  | { kind: "reading"; tempC: number }
  | { kind: "advance"; ms: number }
  | { kind: "sensor_quiet"; ms: number }
  | { kind: "restart" }
  | { kind: "presence"; online: boolean };

const stepArb: fc.Arbitrary<Step> = fc.oneof(
  { weight: 5, arbitrary: fc.record({ kind: fc.constant("reading" as const), tempC: fc.oneof(fc.double({ min: 0, max: 40, noNaN: true }), fc.constantFrom(9, 11, 12, 29.9, 30, 31)) }) },
  { weight: 6, arbitrary: fc.record({ kind: fc.constant("advance" as const), ms: fc.integer({ min: 1, max: 20_000 }) }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant("sensor_quiet" as const), ms: fc.integer({ min: 30_000, max: 400_000 }) }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant("restart" as const) }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant("presence" as const), online: fc.boolean() }) },
);

class World {
  nowMs = 1_800_000_000_000;
  seq = 0;
  ids = 0;
  ctl: PlugSwitchState;
  plug = { on: false, leaseUntilMs: 0, clockMs: 0, fellBack: 0 };
  toPlug: Message<{ id: string; on: boolean }>[] = [];
  toController: Message<{ on: boolean; cmd: string | null; plugTimeMs: number }>[] = [];
  log: Row[] = [];
  reading: { tempC: number; atMs: number } | null = null;
  latest: Decision | null = null;
  /** The plug's own time on the report being handled, if any. */
  reportPlugMs: number | null = null;
  sends: { on: boolean; atMs: number; decidedOn: boolean | null; freshTempC: number | null }[] = [];

  constructor(
    readonly settings: LifecycleSettings,
    readonly faults: Faults,
    readonly random: () => number,
  ) {
    this.ctl = restoredState(null, this.nowMs);
  }

  newId = () => `c${++this.ids}`;

  private schedule<T>(queue: Message<T>[], message: T) {
    if (this.random() < this.faults.lose) return;
    const copies = this.random() < this.faults.duplicate ? 2 : 1;
    for (let i = 0; i < copies; i++) {
      queue.push({ ...message, deliverAtMs: this.nowMs + Math.floor(this.random() * this.faults.maxDelayMs), seq: ++this.seq });
    }
  }

  apply(effects: readonly SwitchEffect[]) {
    for (const effect of effects) {
      switch (effect.type) {
        case "send":
          this.sends.push({ on: effect.on, atMs: this.nowMs, decidedOn: this.latest?.on ?? null, freshTempC: this.freshTempC() });
          this.schedule(this.toPlug, { id: effect.id, on: effect.on });
          break;
        case "record":
          expect(this.log.some((r) => r.commandId === effect.row.commandId), "recorded once").toBe(false);
          this.log.push({ ...effect.row, acked: effect.row.ackAtMs !== null, withdrawn: false, confirmedByPlugAtMs: effect.row.ackAtMs !== null ? this.reportPlugMs : null });
          break;
        case "acknowledge": {
          const row = this.log.find((r) => r.commandId === effect.commandId);
          expect(row, "acknowledged a recorded switch").toBeDefined();
          expect(row!.acked || row!.withdrawn, "acknowledged once, never after a withdrawal").toBe(false);
          row!.acked = true;
          row!.ackAtMs = effect.atMs;
          row!.confirmedByPlugAtMs = this.reportPlugMs;
          break;
        }
        case "withdraw": {
          const row = this.log.find((r) => r.commandId === effect.commandId);
          expect(row, "withdrew a recorded switch").toBeDefined();
          expect(row!.acked || row!.withdrawn, "withdrawn once, never after an acknowledgement").toBe(false);
          row!.withdrawn = true;
          break;
        }
        default:
          break;
      }
    }
  }

  freshTempC() {
    return this.reading && this.nowMs - this.reading.atMs <= STALE_AFTER_S * 1000 ? this.reading.tempC : null;
  }

  decideNow() {
    const decision = decide({
      rules,
      nowMs: this.nowMs,
      reading: this.reading,
      current: this.ctl.on === null ? null : { on: this.ctl.on, sinceMs: this.ctl.sinceMs },
      override: null,
      window,
    });
    this.latest = decision;
    this.run({ type: "decision", decision, context: { readingAtMs: this.reading?.atMs ?? null, userId: null, overrideId: null } });
  }

  run(event: Parameters<typeof stepSwitch>[1]) {
    const { state, effects } = stepSwitch(this.ctl, event, this.nowMs, this.settings, this.newId);
    this.ctl = state;
    this.apply(effects);
    this.checkInvariants();
  }

  /** What the stored state says after the log's writes: the end of the chain, and a switch on its way. */
  stored(): StoredSwitchState {
    const kept = this.log.filter((r) => !r.withdrawn);
    const last = kept.at(-1);
    const newestReportMs = this.ctl.newestReportMs;
    if (!last) return { on: null, sinceMs: null, switchId: null, pending: null, presentCause: null, newestReportMs };
    if (last.acked) return { on: last.toOn, sinceMs: last.ackAtMs, switchId: last.commandId, pending: null, presentCause: null, newestReportMs };
    const before = kept.at(-2);
    return {
      on: last.fromOn,
      sinceMs: before?.ackAtMs ?? null,
      switchId: before?.commandId ?? null,
      pending: { id: last.commandId, on: last.toOn, sinceMs: last.atMs },
      presentCause: null,
      newestReportMs,
    };
  }

  private plugReport(cmd: string | null) {
    this.plug.clockMs = Math.max(this.nowMs, this.plug.clockMs + 1);
    this.schedule(this.toController, { on: this.plug.on, cmd, plugTimeMs: this.plug.clockMs });
  }

  /** Time passes: messages land in the order of their arrival, the plug's lease runs, the controller ticks. */
  advance(ms: number) {
    const end = this.nowMs + ms;
    while (this.nowMs < end) {
      this.nowMs = Math.min(end, this.nowMs + TICK_MS);
      const due = [...this.toPlug.filter((m) => m.deliverAtMs <= this.nowMs).map((m) => ({ to: "plug" as const, m })),
        ...this.toController.filter((m) => m.deliverAtMs <= this.nowMs).map((m) => ({ to: "controller" as const, m }))]
        .sort((a, b) => a.m.deliverAtMs - b.m.deliverAtMs || a.m.seq - b.m.seq);
      this.toPlug = this.toPlug.filter((m) => m.deliverAtMs > this.nowMs);
      this.toController = this.toController.filter((m) => m.deliverAtMs > this.nowMs);
      for (const { to, m } of due) {
        if (to === "plug") {
          const command = m as Message<{ id: string; on: boolean }>;
          this.plug.on = command.on;
          this.plug.leaseUntilMs = this.nowMs + this.settings.leaseS * 1000;
          this.plugReport(command.id);
        } else {
          const report = m as Message<{ on: boolean; cmd: string | null; plugTimeMs: number }>;
          this.reportPlugMs = report.plugTimeMs;
          this.run({ type: "report", on: report.on, cmd: report.cmd, plugTimeMs: report.plugTimeMs });
          this.reportPlugMs = null;
          this.decideNow();
        }
      }
      // The plug's own fail-safe (off) when its lease runs out.
      if (this.plug.on && this.plug.leaseUntilMs > 0 && this.nowMs >= this.plug.leaseUntilMs) {
        this.plug.on = false;
        this.plug.fellBack++;
        this.plugReport(null);
      }
      this.decideNow();
      this.run({ type: "timer" });
    }
  }

  checkInvariants() {
    // The log is a chain over the switches that happened (withdrawn ones aside).
    const kept = this.log.filter((r) => !r.withdrawn);
    for (let i = 1; i < kept.length; i++) expect(kept[i]!.fromOn, `row ${kept[i]!.commandId} starts where ${kept[i - 1]!.commandId} ended`).toBe(kept[i - 1]!.toOn);
    // The log follows the plug's own history: no older report is taken after a newer one.
    const confirmed = kept.filter((r) => r.confirmedByPlugAtMs !== null);
    for (let i = 1; i < confirmed.length; i++) expect(confirmed[i]!.confirmedByPlugAtMs!).toBeGreaterThanOrEqual(confirmed[i - 1]!.confirmedByPlugAtMs!);
    // The controller's state is a confirmed, kept switch.
    if (this.ctl.switchId !== null) {
      const row = this.log.find((r) => r.commandId === this.ctl.switchId);
      expect(row && row.acked && !row.withdrawn, "state comes from a confirmed, kept switch").toBe(true);
      expect(row!.toOn).toBe(this.ctl.on);
    }
    // A command in flight: a switch is logged and kept; anything else keeps the state.
    const command = this.ctl.command;
    if (command?.isSwitch) {
      expect(command.on).not.toBe(this.ctl.on);
      const row = this.log.find((r) => r.commandId === command.id);
      expect(row && !row.acked && !row.withdrawn, "a switch in flight is logged and open").toBe(true);
      expect(kept.at(-1)?.commandId).toBe(command.id);
    } else if (command) {
      expect(command.on).toBe(this.ctl.on);
    }
  }
}

function play(steps: Step[], faults: Faults, seed: number, leaseS = 90) {
  let state = seed >>> 0 || 1;
  const random = () => {
    // xorshift32: the faults are random but the run can be replayed from its seed.
    state ^= state << 13;
    state ^= state >>> 17;
    state ^= state << 5;
    return (state >>> 0) / 0x1_0000_0000;
  };
  const world = new World({ leaseS, ackTimeoutMs: 2000, maxRetryMs: 30_000, unansweredAfter: 4 }, faults, random);
  for (const step of steps) {
    switch (step.kind) {
      case "reading":
        world.reading = { tempC: step.tempC, atMs: world.nowMs };
        world.decideNow();
        world.run({ type: "timer" });
        break;
      case "advance":
        world.advance(step.ms);
        break;
      case "sensor_quiet":
        world.advance(step.ms);
        break;
      case "restart": {
        const stored = world.stored();
        world.ctl = restoredState(stored, world.nowMs);
        world.checkInvariants();
        break;
      }
      case "presence":
        world.run({ type: "presence", online: step.online });
        break;
    }
  }
  return world;
}

const faultsArb = fc.record({
  lose: fc.constantFrom(0, 0.05, 0.2),
  duplicate: fc.constantFrom(0, 0.1, 0.3),
  maxDelayMs: fc.constantFrom(1, 500, 5000),
});

// Hundreds of runs each: well past the default 5 s on a busy 2-core machine.
describe("the switch lifecycle, over random event sequences", { timeout: 120_000 }, () => {
  it("keeps the log a chain that follows the plug's own history, stores each switch once, and never takes a withdrawn switch as the state", () => {
    fc.assert(
      fc.property(fc.array(stepArb, { minLength: 1, maxLength: 60 }), faultsArb, fc.integer(), (steps, faults, seed) => {
        play(steps, faults, seed);
      }),
      { numRuns: 200 },
    );
  });

  it("every command follows the latest decision: no 'on' goes out at or above the high limit", () => {
    fc.assert(
      fc.property(fc.array(stepArb, { minLength: 1, maxLength: 60 }), faultsArb, fc.integer(), (steps, faults, seed) => {
        const world = play(steps, faults, seed);
        for (const send of world.sends) {
          expect(send.on).toBe(send.decidedOn);
          if (send.on && send.freshTempC !== null) expect(send.freshTempC).toBeLessThan(HIGH_LIMIT_C);
        }
      }),
      { numRuns: 120 },
    );
  });

  it("sends the command again before the lease runs out, so a plug that hears every command never falls back", () => {
    fc.assert(
      fc.property(
        fc.array(stepArb.filter((s) => s.kind !== "restart" && s.kind !== "presence"), { minLength: 1, maxLength: 60 }),
        fc.record({ lose: fc.constant(0), duplicate: fc.constantFrom(0, 0.3), maxDelayMs: fc.constantFrom(1, 500) }),
        fc.integer(),
        fc.constantFrom(30, 90, 900),
        (steps, faults, seed, leaseS) => {
          const world = play(steps, faults, seed, leaseS);
          expect(world.plug.fellBack).toBe(0);
        },
      ),
      { numRuns: 200 },
    );
  });

  it("once the network is sound again, the log ends where the plug is", () => {
    fc.assert(
      fc.property(fc.array(stepArb, { minLength: 1, maxLength: 60 }), faultsArb, fc.integer(), (steps, faults, seed) => {
        const world = play(steps, faults, seed);
        world.reading = { tempC: 11, atMs: world.nowMs };
        world.faults.lose = 0;
        world.faults.duplicate = 0;
        world.faults.maxDelayMs = 1;
        world.run({ type: "presence", online: true });
        // Long enough for every back-off to run out and the readings to stay fresh.
        for (let i = 0; i < 8; i++) {
          world.reading = { tempC: world.reading.tempC, atMs: world.nowMs };
          world.advance(20_000);
        }
        const kept = world.log.filter((r) => !r.withdrawn);
        // A lease refresh may be on its way; a switch may not.
        expect(world.ctl.command?.isSwitch ?? false).toBe(false);
        expect(world.ctl.on).toBe(world.plug.on);
        expect(kept.at(-1)?.toOn ?? false).toBe(world.plug.on);
      }),
      { numRuns: 200 },
    );
  });
});
