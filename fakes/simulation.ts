// The demo site's hardware in one process: a thermal model per house, a simulated plug
// per plug row and a simulated sensor per sensor row, all on one clock. Each plug's
// power goes into its house as heat (a heater's on purpose, a lamp's or a fan's too).
import pino, { type Logger } from "pino";
import { connect } from "../db/client";
import { deviceUsername } from "../lib/mqtt/credentials";
import { createSiteModel, houseParams, type HouseSnapshot, type SiteModel } from "./house-model";
import { loadSiteLayout, readDeviceSecrets, type SiteLayout } from "./layout";
import { startPlugDevice, type PlugDevice } from "./plug-device";
import { startSensorDevice, type SensorDevice } from "./sensor-device";
import { seedFrom } from "./random";
import { plugJournalWriter } from "./journal";
import type { Climate } from "./weather";

export type SimulationOptions = {
  mqttUrl: string;
  /** Read the layout from here when `layout` is not given. */
  databaseUrl?: string;
  site: string;
  layout?: SiteLayout;
  secretsFile: string;
  /** Secrets by MQTT user name; when given the file is not read. */
  secrets?: Record<string, string>;
  /** Simulated seconds per real second for the built-in clock. */
  speed: number;
  /** Simulated time at start (default: now). */
  startMs?: number;
  /** The simulated clock; replaces the built-in one (then `speed` is unused). */
  now?: () => number;
  /** Real ms between the simulation's own ticks; 0: the caller calls `tick()`. */
  tickMs: number;
  /** The thermal model's fixed step, simulated ms. */
  stepMs: number;
  seed: number;
  climate?: Partial<Climate>;
  /** Starting air temperature by house id (default: the outside temperature). */
  initialC?: Record<string, number>;
  sensorIntervalMs: number;
  plugReportEveryMs: number;
  reconnectPeriod: number;
  /** Each plug's journal (fakes/journal.ts) is appended here when set. */
  journalFile?: string;
  /** Device ids of plugs and sensors left out (run on their own elsewhere, e.g. fakes/one-plug.ts). */
  except?: readonly string[];
  logger?: Logger;
};

export const SIMULATION_DEFAULTS = {
  mqttUrl: "mqtt://127.0.0.1:1886",
  site: "fernhollow",
  secretsFile: ".data/device-secrets.json",
  speed: 1,
  tickMs: 1000,
  stepMs: 10_000,
  seed: 1,
  sensorIntervalMs: 5000,
  plugReportEveryMs: 60_000,
  reconnectPeriod: 2000,
} satisfies Partial<SimulationOptions>;

export type Simulation = {
  readonly layout: SiteLayout;
  readonly model: SiteModel;
  readonly plugs: ReadonlyMap<string, PlugDevice>;
  readonly sensors: ReadonlyMap<string, SensorDevice>;
  now(): number;
  /** Brings everything to `nowMs` (default: the clock): leases, the houses, readings. */
  tick(nowMs?: number): Promise<void>;
  /** A house's model by id or name. */
  house(idOrName: string): HouseSnapshot;
  close(): Promise<void>;
};

async function layoutOf(o: SimulationOptions) {
  if (o.layout) return o.layout;
  if (!o.databaseUrl) throw new Error("DATABASE_URL (or a layout) is needed to know the site's houses and devices");
  const { db, pool } = connect(o.databaseUrl);
  try {
    return await loadSiteLayout(db, o.site);
  } finally {
    await pool.end();
  }
}

export async function createSimulation(options: Partial<SimulationOptions> = {}): Promise<Simulation> {
  const o: SimulationOptions = { ...SIMULATION_DEFAULTS, ...options };
  const log = o.logger ?? pino({ level: "silent" });
  const realStart = Date.now();
  const simStart = o.startMs ?? realStart;
  const now = o.now ?? (() => simStart + (Date.now() - realStart) * o.speed);

  const full = await layoutOf(o);
  const left = new Set(o.except ?? []);
  const layout: SiteLayout = { ...full, plugs: full.plugs.filter((p) => !left.has(p.deviceId)), sensors: full.sensors.filter((s) => !left.has(s.deviceId)) };
  const journal = o.journalFile ? plugJournalWriter(o.journalFile) : undefined;
  const secrets = o.secrets ?? (await readDeviceSecrets(o.secretsFile));
  const site = layout.site.slug;

  const plugs = new Map<string, PlugDevice>();
  const sensors = new Map<string, SensorDevice>();
  const plugsByHouse = new Map<string, PlugDevice[]>();

  const model = createSiteModel({
    timeZone: layout.site.timeZone,
    climate: o.climate,
    seed: o.seed,
    startMs: now(),
    stepMs: o.stepMs,
    houses: layout.houses.map((h) => ({
      id: h.id,
      params: houseParams(h.shape),
      initial: o.initialC?.[h.id] === undefined ? undefined : { airC: o.initialC[h.id] },
    })),
    heatW: (houseId) => (plugsByHouse.get(houseId) ?? []).reduce((sum, p) => sum + p.state.watts, 0),
  });

  const houseByName = new Map(layout.houses.map((h) => [h.name, h.id]));
  const house = (idOrName: string) => model.snapshot(houseByName.get(idOrName) ?? idOrName);

  const secretOf = (kind: "plug" | "sensor", device: string) => {
    const secret = secrets[deviceUsername(site, kind, device)];
    if (!secret) log.warn({ kind, device }, "no MQTT secret for this device; it stays unplugged");
    return secret;
  };

  const starts = [
    ...layout.plugs.map(async (p) => {
      const password = secretOf("plug", p.deviceId);
      if (!password) return;
      const device = await startPlugDevice({
        url: o.mqttUrl,
        site,
        device: p.deviceId,
        password,
        ratedW: p.applianceWatts,
        failsafeOn: p.failsafeOn,
        meters: p.metersEnergy,
        now,
        tickMs: 0,
        reportEveryMs: o.plugReportEveryMs,
        reconnectPeriod: o.reconnectPeriod,
        seed: seedFrom(p.deviceId, o.seed),
        logger: log,
        journal,
        onSwitch: (on, atMs, cause) => log.info({ plug: p.deviceId, on, at: new Date(atMs).toISOString(), cause }, "plug switched"),
      });
      plugs.set(p.deviceId, device);
      plugsByHouse.set(p.houseId, [...(plugsByHouse.get(p.houseId) ?? []), device]);
    }),
    ...layout.sensors.map(async (s) => {
      const password = secretOf("sensor", s.deviceId);
      if (!password) return;
      const device = await startSensorDevice({
        url: o.mqttUrl,
        site,
        device: s.deviceId,
        password,
        now,
        tickMs: 0,
        intervalMs: o.sensorIntervalMs,
        reconnectPeriod: o.reconnectPeriod,
        logger: log,
        read: () => {
          const h = model.snapshot(s.houseId);
          return s.placement === "outside" ? { tempC: h.weather.outsideC, rh: h.weather.outsideRh } : { tempC: h.airC, rh: h.rh };
        },
      });
      sensors.set(s.deviceId, device);
    }),
  ];
  for (const result of await Promise.allSettled(starts)) {
    if (result.status === "rejected") log.error({ err: result.reason }, "a simulated device could not connect");
  }

  let ticking: Promise<void> | undefined;
  const tickOnce = async (nowMs: number) => {
    // A lease that runs out inside this stretch switches the plug at its own time, so a
    // big jump of a fake clock heats the house for the right part of it only.
    const due = [...plugs.values()]
      .filter((p) => p.state.leaseUntilMs !== null && p.state.leaseUntilMs < nowMs)
      .sort((a, b) => a.state.leaseUntilMs! - b.state.leaseUntilMs!);
    for (const p of due) {
      const until = p.state.leaseUntilMs;
      if (until === null || until >= nowMs) continue;
      model.advanceTo(until + 1);
      await p.tick(until + 1);
    }
    model.advanceTo(nowMs);
    await Promise.all([...plugs.values()].map((p) => p.tick(nowMs)));
    await Promise.all([...sensors.values()].map((s) => s.tick(nowMs)));
  };
  const tick = async (nowMs = now()) => {
    while (ticking) await ticking;
    ticking = tickOnce(nowMs).finally(() => (ticking = undefined));
    return ticking;
  };

  let busy = false;
  const timer =
    o.tickMs > 0
      ? setInterval(() => {
          if (busy) return;
          busy = true;
          tick()
            .catch((error) => log.error({ err: error }, "simulation tick failed"))
            .finally(() => (busy = false));
        }, o.tickMs)
      : undefined;

  log.info({ site, houses: layout.houses.length, plugs: plugs.size, sensors: sensors.size, speed: o.now ? "external clock" : o.speed }, "simulation running");

  let closing: Promise<void> | undefined;
  return {
    layout,
    model,
    plugs,
    sensors,
    now,
    tick,
    house,
    close() {
      closing ??= (async () => {
        clearInterval(timer);
        // A tick under way finishes before its devices go (its failure is logged where it runs).
        await ticking?.catch(() => undefined);
        await Promise.allSettled([...plugs.values(), ...sensors.values()].map((d) => d.close()));
      })();
      return closing;
    },
  };
}
