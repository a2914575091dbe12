// The controller's picture of its plugs and sensors: their settings, compiled
// schedules, overrides, switch lifecycle state and the latest readings. A reload
// replaces the sites it covers and keeps everything else.
import type { PlugRules } from "@/lib/control";
import { DEFAULT_ALERT_RULES } from "@/lib/alerts/rules";
import type { PlugSwitchState } from "@/lib/control/switch-lifecycle";
import type { Decision } from "@/lib/control";
import { groupBy } from "@/lib/group-by";
import { plugTopic } from "@/lib/mqtt/topics";
import { compilePlugSchedule, type PlugSchedule } from "./plug-schedule";
import type { HouseAlertContext, PlugAlertContext, SensorAlertContext } from "@/lib/alerts/evaluate";
import { rulesOf, type Config, type HouseConfig, type OverrideConfig, type PlugConfig, type SiteConfig } from "./config";

export type PlugRuntime = {
  config: PlugConfig;
  site: SiteConfig;
  rules: PlugRules;
  schedule: PlugSchedule;
  /** What the schedule was compiled from. */
  scheduleKey: string;
  overrides: (OverrideConfig & { endsMs: number })[];
  topic: string;
  switching: PlugSwitchState;
  last: Decision | null;
  /** Bumped by a reload: names and settings may have changed, so alerts are looked at again. */
  alertGeneration: number;
  /** Its name and house (with the house's alert rules), for the rule-based alerts. */
  alert: PlugAlertContext;
};

export type SensorRuntime = { id: string; siteId: string; houseId: string; alert: SensorAlertContext };

/** The latest reading of a sensor: when it arrived, and its temperature, humidity (%) and battery (0..1). */
export type LatestReading = { tempC: number | null; rh: number | null; battery: number | null; atMs: number };

function houseContext(house: HouseConfig | undefined, houseId: string): HouseAlertContext {
  // A house always loads with its plugs and sensors (same sites); this only keeps the type honest.
  return house
    ? { id: house.id, name: house.name, lowLimitC: house.lowLimitC, rules: house.alertRules }
    : { id: houseId, name: "its house", lowLimitC: 2, rules: DEFAULT_ALERT_RULES };
}

export function createRegistry() {
  let plugsByDevice = new Map<string, PlugRuntime>();
  let sensorsByDevice = new Map<string, SensorRuntime>();
  let plugsBySensor = new Map<string, PlugRuntime[]>();
  const latestReading = new Map<string, LatestReading>();

  /**
   * Takes in a fresh configuration of `config.sites` (all sites the controller
   * serves, or only those reloaded). Plugs it knows keep their switching state;
   * `startOf` gives a new plug's state.
   */
  function apply(config: Config, startOf: (plug: PlugConfig) => PlugSwitchState, replacesAll: boolean) {
    const reloaded = new Set(config.sites.map((s) => s.id));
    const sitesById = new Map(config.sites.map((s) => [s.id, s]));
    const next = new Map<string, PlugRuntime>();
    const previous = new Map<string, PlugRuntime>();
    for (const [key, runtime] of plugsByDevice) {
      if (replacesAll || reloaded.has(runtime.site.id)) previous.set(runtime.config.id, runtime);
      else next.set(key, runtime);
    }
    const houseById = new Map(config.houses.map((h) => [h.id, h]));
    const houses = new Map<string, HouseAlertContext>();
    const houseOf = (houseId: string) => {
      let house = houses.get(houseId);
      if (!house) houses.set(houseId, (house = houseContext(houseById.get(houseId), houseId)));
      return house;
    };
    const schedulesOf = groupBy(config.schedules, (s) => s.plugId);
    const overridesOf = groupBy(config.overrides, (o) => o.plugId);
    for (const plug of config.plugs) {
      const site = sitesById.get(plug.siteId);
      if (!site) continue;
      const before = previous.get(plug.id);
      // Most reloads change few schedules: keep those compiled, so the edge after a
      // reload is not held up compiling them all.
      const plugSchedules = schedulesOf.get(plug.id) ?? [];
      const scheduleKey = `${site.timeZone} ${JSON.stringify(plugSchedules)}`;
      const schedule = before?.scheduleKey === scheduleKey ? before.schedule : compilePlugSchedule(plugSchedules, site.timeZone);
      const overrides = (overridesOf.get(plug.id) ?? []).map((o) => ({
        ...o,
        endsMs: o.endsAt
          ? o.endsAt.getTime()
          : o.untilNextChange
            ? (schedule.nextChangeAfter(o.startsAt.getTime()) ?? Number.POSITIVE_INFINITY)
            : Number.POSITIVE_INFINITY,
      }));
      next.set(`${site.slug}/${plug.deviceId}`, {
        config: plug,
        site,
        rules: rulesOf(plug, site),
        schedule,
        scheduleKey,
        overrides,
        topic: plugTopic(site.slug, plug.deviceId, "command"),
        switching: before?.switching ?? startOf(plug),
        last: before?.last ?? null,
        alertGeneration: -1,
        alert: { id: plug.id, name: plug.name, isHeater: plug.applianceKind === "heater", refreshMs: (plug.leaseS * 1000) / 3, house: houseOf(plug.houseId) },
      });
    }
    plugsByDevice = next;

    const sensors = new Map<string, SensorRuntime>();
    for (const [key, sensor] of sensorsByDevice) if (!replacesAll && !reloaded.has(sensor.siteId)) sensors.set(key, sensor);
    for (const s of config.sensors) {
      const site = sitesById.get(s.siteId);
      if (!site) continue;
      const alert = { id: s.id, name: s.name, outside: s.placement === "outside", house: houseOf(s.houseId) };
      sensors.set(`${site.slug}/${s.deviceId}`, { id: s.id, siteId: s.siteId, houseId: s.houseId, alert });
    }
    sensorsByDevice = sensors;

    plugsBySensor = new Map();
    for (const runtime of plugsByDevice.values()) {
      const sensorId = runtime.config.sensorId;
      if (!sensorId) continue;
      const list = plugsBySensor.get(sensorId) ?? [];
      list.push(runtime);
      plugsBySensor.set(sensorId, list);
    }
  }

  return {
    apply,
    /** Plugs the registry does not hold yet, of those in a configuration. */
    unknownPlugs(config: Config) {
      const known = new Set([...plugsByDevice.values()].map((r) => r.config.id));
      return config.plugs.filter((p) => !known.has(p.id));
    },
    plug: (siteSlug: string, deviceId: string) => plugsByDevice.get(`${siteSlug}/${deviceId}`),
    sensor: (siteSlug: string, deviceId: string) => sensorsByDevice.get(`${siteSlug}/${deviceId}`),
    plugs: () => plugsByDevice.values(),
    sensorIds: () => [...sensorsByDevice.values()].map((s) => s.id),
    sensors: () => sensorsByDevice.values(),
    plugsFollowing: (sensorId: string) => plugsBySensor.get(sensorId) ?? [],
    reading: (sensorId: string) => latestReading.get(sensorId) ?? null,
    setReading: (sensorId: string, reading: LatestReading) => latestReading.set(sensorId, reading),
  };
}

export type Registry = ReturnType<typeof createRegistry>;
