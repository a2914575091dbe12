// What a simulated plug does, without the network: obey commands, hold each one for its
// lease, fall back to its own fail-safe state when the lease runs out, and meter.
// Every function takes the time as an argument and returns a new state.
import type { CommandPayload, ReportPayload } from "../lib/mqtt/topics";

export type PlugConfig = {
  /** The appliance's rated watts. */
  ratedW: number;
  /** State to fall back to when a lease runs out (and to start in). */
  failsafeOn: boolean;
  /** Without a meter the report's watts and wh are null. */
  meters: boolean;
};

export type PlugState = {
  on: boolean;
  /** Id of the command the state comes from; null at start and after a fall-back. */
  cmd: string | null;
  leaseUntilMs: number | null;
  /** Power drawn now (0 when off). */
  watts: number;
  wh: number;
  meteredToMs: number;
};

export function initialPlugState(config: PlugConfig, nowMs: number, on = config.failsafeOn): PlugState {
  return { on, cmd: null, leaseUntilMs: null, watts: on ? config.ratedW : 0, wh: 0, meteredToMs: nowMs };
}

/** Adds the energy drawn since the last reading; time running backwards adds nothing. */
export function meter(s: PlugState, nowMs: number): PlugState {
  if (nowMs <= s.meteredToMs) return s;
  return { ...s, wh: s.wh + (s.watts * (nowMs - s.meteredToMs)) / 3_600_000, meteredToMs: nowMs };
}

/** Power drawn in a state: the rated watts, nudged by `jitter` in [-1, 1] (±1.5 %), or 0. */
export function drawW(config: PlugConfig, on: boolean, jitter: number) {
  return on ? config.ratedW * (1 + 0.015 * Math.max(-1, Math.min(1, jitter))) : 0;
}

export function applyCommand(config: PlugConfig, s: PlugState, command: CommandPayload, nowMs: number, jitter = 0): PlugState {
  const metered = meter(s, nowMs);
  return {
    ...metered,
    on: command.on,
    cmd: command.id,
    leaseUntilMs: nowMs + command.lease_s * 1000,
    watts: drawW(config, command.on, jitter),
  };
}

/** Past the lease the plug takes its fail-safe state and forgets the command. */
export function leaseExpired(s: PlugState, nowMs: number) {
  return s.leaseUntilMs !== null && nowMs > s.leaseUntilMs;
}

export function fallBack(config: PlugConfig, s: PlugState, nowMs: number, jitter = 0): PlugState {
  const metered = meter(s, nowMs);
  return { ...metered, on: config.failsafeOn, cmd: null, leaseUntilMs: null, watts: drawW(config, config.failsafeOn, jitter) };
}

/** A fresh meter sample while the state holds. */
export function resample(config: PlugConfig, s: PlugState, nowMs: number, jitter: number): PlugState {
  return { ...meter(s, nowMs), watts: drawW(config, s.on, jitter) };
}

export function reportOf(config: PlugConfig, s: PlugState, nowMs: number): ReportPayload {
  const m = meter(s, nowMs);
  return {
    on: m.on,
    cmd: m.cmd,
    watts: config.meters ? Math.round(m.watts) : null,
    wh: config.meters ? Math.round(m.wh * 10) / 10 : null,
    at: new Date(nowMs).toISOString(),
  };
}
