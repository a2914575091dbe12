// A runtime, kWh and cost report from roll-up cells: per plug, house and site, in
// buckets of a day, a week or a month, with the tariffs' standing charges and tax.
// Costs use the plug's metered energy where its meter was heard, its rated energy elsewhere.
import { DateTime } from "luxon";
import { daysFromTo } from "./calendar";
import { wattMsToKwh, wsToKwh } from "./runtime";
import { tariffOn, type Tariff } from "./tariff";

export const REPORT_BUCKETS = ["day", "week", "month"] as const;
export type ReportBucket = (typeof REPORT_BUCKETS)[number];

/**
 * Summed roll-up of one plug, local day (or bucket) and rate. `costedWs` is the energy
 * the cost is worked on: metered where the meter covers, rated elsewhere.
 */
export type ReportCell = { plugId: string; day: string; rateKey: string; onMs: number; ratedWattMs: number; meteredWs: number | null; costedWs: number };

export type ReportPlug = { id: string; name: string; houseId: string; metersEnergy: boolean; applianceWatts: number; retired: boolean };
export type ReportHouse = { id: string; name: string };

export type Figures = {
  onHours: number;
  ratedKwh: number;
  /** Null where no plug in the sum meters its energy. */
  meteredKwh: number | null;
  /** The kWh the cost is worked on: metered where the plug's meter was heard, rated elsewhere. */
  costedKwh: number;
  /** Energy cost with tax; null when none of it falls under a tariff. */
  cost: number | null;
  /** kWh that no tariff covers, so not costed. */
  unpricedKwh: number;
};

export type EnergyReport = {
  fromDay: string;
  toDay: string;
  /** Days of the range up to today: the days that have standing charges. */
  daysElapsed: number;
  bucket: ReportBucket;
  site: Figures & { standingCharge: number; tax: number; total: number | null };
  houses: (Figures & { id: string; name: string; plugs: (Figures & ReportPlug)[] })[];
  rates: { rateKey: string; tariff: string; label: string; pricePerKwh: number; costedKwh: number; cost: number }[];
  tariffs: { id: string; name: string; kind: Tariff["kind"]; fromDay: string; toDay: string; days: number; standingChargePerDay: number; taxPercent: number }[];
  series: (Figures & {
    key: string;
    fromDay: string;
    toDay: string;
    /** Standing charges (with tax) of the bucket's days that have begun. */
    standingCharge: number;
    byHouse: Record<string, Figures>;
    byPlug: Record<string, Figures>;
  })[];
};

type Rate = { tariff: Tariff; price: number; label: string };

const empty = (): Figures => ({ onHours: 0, ratedKwh: 0, meteredKwh: null, costedKwh: 0, cost: null, unpricedKwh: 0 });

function add(into: Figures, f: Figures) {
  into.onHours += f.onHours;
  into.ratedKwh += f.ratedKwh;
  if (f.meteredKwh !== null) into.meteredKwh = (into.meteredKwh ?? 0) + f.meteredKwh;
  into.costedKwh += f.costedKwh;
  if (f.cost !== null) into.cost = (into.cost ?? 0) + f.cost;
  into.unpricedKwh += f.unpricedKwh;
}

/** The start of the bucket a local date falls in: itself, its ISO week's Monday, or its month's first. */
export function bucketOf(day: string, bucket: ReportBucket): string {
  if (bucket === "day") return day;
  const d = DateTime.fromISO(day, { zone: "UTC" });
  return (bucket === "week" ? d.startOf("week") : d.startOf("month")).toISODate()!;
}

function bucketEnd(start: string, bucket: ReportBucket): string {
  if (bucket === "day") return start;
  const d = DateTime.fromISO(start, { zone: "UTC" });
  return (bucket === "week" ? d.endOf("week") : d.endOf("month")).toISODate()!;
}

export function buildReport(input: {
  fromDay: string;
  toDay: string;
  today: string;
  bucket: ReportBucket;
  tariffs: readonly Tariff[];
  houses: readonly ReportHouse[];
  plugs: readonly ReportPlug[];
  cells: readonly ReportCell[];
}): EnergyReport {
  const { fromDay, toDay, bucket, tariffs } = input;
  const rates = new Map<string, Rate>();
  for (const tariff of tariffs) for (const r of tariff.rates) rates.set(r.id, { tariff, price: r.pricePerKwh, label: r.label });
  const plugById = new Map(input.plugs.map((p) => [p.id, p]));
  // A year's report has tens of thousands of cells over a few hundred days.
  const bucketKeys = new Map<string, string>();
  const bucketKey = (day: string) => {
    let key = bucketKeys.get(day);
    if (key === undefined) bucketKeys.set(day, (key = bucketOf(day, bucket)));
    return key;
  };

  const plugFigures = new Map<string, Figures>();
  const rateTotals = new Map<string, { costedKwh: number; cost: number }>();
  const buckets = new Map<string, { total: Figures; standingCharge: number; byHouse: Record<string, Figures>; byPlug: Record<string, Figures> }>();
  for (const day of daysFromTo(fromDay, toDay)) {
    const key = bucketKey(day);
    if (!buckets.has(key)) buckets.set(key, { total: empty(), standingCharge: 0, byHouse: {}, byPlug: {} });
  }

  for (const cell of input.cells) {
    const plug = plugById.get(cell.plugId);
    if (!plug || cell.day < fromDay || cell.day > toDay) continue;
    const ratedKwh = wattMsToKwh(cell.ratedWattMs);
    const meteredKwh = plug.metersEnergy && cell.meteredWs !== null ? wsToKwh(cell.meteredWs) : null;
    const costedKwh = wsToKwh(cell.costedWs);
    const rate = rates.get(cell.rateKey);
    const cost = rate ? costedKwh * rate.price * (1 + rate.tariff.taxPercent / 100) : null;
    const f: Figures = { onHours: cell.onMs / 3_600_000, ratedKwh, meteredKwh, costedKwh, cost, unpricedKwh: rate ? 0 : costedKwh };
    if (!plugFigures.has(plug.id)) plugFigures.set(plug.id, empty());
    add(plugFigures.get(plug.id)!, f);
    if (rate) {
      const t = rateTotals.get(cell.rateKey) ?? { costedKwh: 0, cost: 0 };
      t.costedKwh += costedKwh;
      t.cost += cost!;
      rateTotals.set(cell.rateKey, t);
    }
    const b = buckets.get(bucketKey(cell.day))!;
    add(b.total, f);
    add((b.byHouse[plug.houseId] ??= empty()), f);
    add((b.byPlug[plug.id] ??= empty()), f);
  }

  const houses = input.houses.map((house) => {
    const plugs = input.plugs
      .filter((p) => p.houseId === house.id && (!p.retired || plugFigures.has(p.id)))
      .map((p) => ({ ...p, ...(plugFigures.get(p.id) ?? empty()) }));
    const total = empty();
    for (const p of plugs) add(total, p);
    return { id: house.id, name: house.name, ...total, plugs };
  });

  // Standing charges for the days that have begun, each under the tariff of its day.
  const lastCharged = input.today < toDay ? input.today : toDay;
  const tariffDays = new Map<string, { tariff: Tariff; fromDay: string; toDay: string; days: number }>();
  let daysElapsed = 0;
  let standingCharge = 0;
  let standingTax = 0;
  for (const day of fromDay <= lastCharged ? daysFromTo(fromDay, lastCharged) : []) {
    daysElapsed++;
    const tariff = tariffOn(tariffs, day);
    if (!tariff) continue;
    const seen = tariffDays.get(tariff.id);
    if (seen) {
      seen.toDay = day;
      seen.days++;
    } else tariffDays.set(tariff.id, { tariff, fromDay: day, toDay: day, days: 1 });
    const charge = tariff.standingChargePerDay * (1 + tariff.taxPercent / 100);
    standingCharge += charge;
    buckets.get(bucketKey(day))!.standingCharge += charge;
    standingTax += tariff.standingChargePerDay * (tariff.taxPercent / 100);
  }

  const site = empty();
  for (const h of houses) add(site, h);
  let energyTax = 0;
  for (const [rateKey, t] of rateTotals) {
    const tax = rates.get(rateKey)!.tariff.taxPercent;
    energyTax += t.cost - t.cost / (1 + tax / 100);
  }
  const total = site.cost === null && tariffDays.size === 0 ? null : (site.cost ?? 0) + standingCharge;

  return {
    fromDay,
    toDay,
    daysElapsed,
    bucket,
    site: { ...site, standingCharge, tax: energyTax + standingTax, total },
    houses,
    rates: [...rateTotals].map(([rateKey, t]) => {
      const r = rates.get(rateKey)!;
      return { rateKey, tariff: r.tariff.name, label: r.label, pricePerKwh: r.price, ...t };
    }),
    tariffs: [...tariffDays.values()].map(({ tariff, fromDay: f, toDay: t, days }) => ({
      id: tariff.id,
      name: tariff.name,
      kind: tariff.kind,
      fromDay: f,
      toDay: t,
      days,
      standingChargePerDay: tariff.standingChargePerDay,
      taxPercent: tariff.taxPercent,
    })),
    series: [...buckets].map(([key, b]) => ({
      key,
      fromDay: key < fromDay ? fromDay : key,
      toDay: bucketEnd(key, bucket) > toDay ? toDay : bucketEnd(key, bucket),
      ...b.total,
      standingCharge: b.standingCharge,
      byHouse: b.byHouse,
      byPlug: b.byPlug,
    })),
  };
}
