import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { DateTime } from "luxon";
import { Card } from "@/components/ui/Card";
import { Notice } from "@/components/ui/Notice";
import { buttonClasses } from "@/components/ui/Button";
import { CostByHouse } from "@/components/reports/CostByHouse";
import { RuntimeChart } from "@/components/reports/RuntimeChart";
import { ReportRangeForm } from "@/components/reports/ReportRangeForm";
import { dayLabel, rangeLabel, reportFormat } from "@/components/reports/format";
import { getBillPeriodRanges, getEnergyReport } from "@/db/queries/energy";
import { REPORT_BUCKETS } from "@/lib/energy/report";
import { defaultBucket, presetRanges } from "@/lib/energy/report-ranges";
import { can } from "@/lib/permissions";
import { daysInRange, reportQuery } from "@/lib/schemas/report";
import { getCurrentSite } from "../current-site";

type Props = { params: Promise<{ slug: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { site } = await getCurrentSite((await params).slug);
  return { title: `Reports — ${site.name}` };
}

const first = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v);

export default async function ReportsPage({ params, searchParams }: Props) {
  const { site } = await getCurrentSite((await params).slug);
  if (!can(site.role, "reports.view")) notFound();
  const asked = await searchParams;
  const today = DateTime.now().setZone(site.timeZone).toISODate()!;
  const presets = presetRanges(today);
  const fallback = presets[0]!;
  const from = first(asked.from) ?? fallback.from;
  const to = first(asked.to) ?? fallback.to;
  const parsed = reportQuery.safeParse({ from, to, by: first(asked.by) ?? (from <= to ? defaultBucket(daysInRange(from, to)) : "day") });
  const query = parsed.success ? parsed.data : { from: fallback.from, to: fallback.to, by: "day" as const };
  const problem = parsed.success ? null : parsed.error.issues.map((i) => i.message).join("; ");

  const [report, bills] = await Promise.all([
    getEnergyReport({ siteId: site.id, fromDay: query.from, toDay: query.to, bucket: query.by }),
    getBillPeriodRanges({ siteId: site.id }),
  ]);
  const f = reportFormat(report.currency);
  const base = `/sites/${site.slug}/reports`;
  const qs = new URLSearchParams({ from: query.from, to: query.to, by: query.by }).toString();
  const apiBase = `/api/sites/${site.id}/reports/energy`;
  const uncovered = report.daysElapsed - report.tariffs.reduce((n, t) => n + t.days, 0);
  const s = report.site;

  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-col gap-1">
        <h1 className="text-2xl font-semibold text-frost-950">Runtime, energy and cost</h1>
        <p className="text-sm text-frost-600">
          {rangeLabel(query.from, query.to)}, in {site.timeZone} days. Worked out from every switch of every plug.
        </p>
        <nav aria-label="More reports" className="mt-2 flex flex-wrap gap-2">
          <Link className={buttonClasses("secondary")} href={`${base}/tariffs`}>
            Tariffs
          </Link>
          <Link className={buttonClasses("secondary")} href={`${base}/bills`}>
            Bill check
          </Link>
          <Link className={buttonClasses("secondary")} href={`${base}/degree-days`}>
            Degree-days
          </Link>
        </nav>
      </div>

      <ReportRangeForm
        action={base}
        value={query}
        buckets={REPORT_BUCKETS}
        choices={[...presets, ...bills.map((b) => ({ label: b.label ?? `Bill ${rangeLabel(b.from, b.to)}`, from: b.from, to: b.to }))]}
      />
      {problem && <Notice tone="error">That range could not be shown: {problem}. Showing this month instead.</Notice>}

      <section aria-labelledby="totals" className="grid grid-cols-2 gap-3 md:grid-cols-4">
        <h2 id="totals" className="sr-only">
          Totals
        </h2>
        <Figure label="Runtime" value={f.hours(s.onHours)} note="all plugs" />
        <Figure label="Energy" value={f.kwh(s.costedKwh)} note={s.meteredKwh === null ? "from rated power" : `rated ${f.kwh(s.ratedKwh)}, metered ${f.kwh(s.meteredKwh)}`} />
        <Figure label="Energy cost" value={f.money(s.cost)} note="tax included" />
        <Figure
          label="With standing charges"
          value={f.money(s.total)}
          note={`${f.money(s.standingCharge)} for ${report.daysElapsed} ${report.daysElapsed === 1 ? "day" : "days"}`}
        />
      </section>

      {report.tariffs.length === 0 ? (
        <Notice tone="caution">
          No tariff covers these dates, so nothing is costed.{" "}
          {can(site.role, "tariffs.manage") ? (
            <Link className="font-semibold underline" href={`${base}/tariffs`}>
              Add your electricity tariff
            </Link>
          ) : (
            "The site's owner can add the electricity tariff."
          )}
        </Notice>
      ) : (
        uncovered > 0 && <Notice tone="caution">{uncovered} of the days have no tariff; their energy is not costed.</Notice>
      )}

      <Card as="section" className="flex flex-col gap-3 p-4" aria-labelledby="runtime-heading">
        <h2 id="runtime-heading" className="text-lg font-semibold text-frost-900">
          Runtime by {query.by}
        </h2>
        <div className="sm:hidden">
          <RuntimeChart report={report} width={360} id="runtime-narrow" />
        </div>
        <div className="hidden sm:block">
          <RuntimeChart report={report} width={720} id="runtime-wide" />
        </div>
      </Card>

      <Card as="section" className="flex flex-col gap-3 p-4" aria-labelledby="cost-heading">
        <h2 id="cost-heading" className="text-lg font-semibold text-frost-900">
          Energy cost by house
        </h2>
        {report.houses.length ? <CostByHouse report={report} currency={report.currency} /> : <p className="text-sm text-frost-600">This site has no houses yet.</p>}
      </Card>

      {report.houses.map((house) => (
        <Card as="section" key={house.id} className="flex flex-col gap-2 p-4" aria-labelledby={`house-${house.id}`}>
          <h2 id={`house-${house.id}`} className="text-lg font-semibold text-frost-900">
            {house.name}
          </h2>
          <ul className="flex flex-col divide-y divide-frost-100 sm:hidden">
            {[...house.plugs, { ...house, id: `${house.id}-total`, name: "House total", retired: false, metersEnergy: house.meteredKwh !== null, applianceWatts: 0 }].map((p) => (
              <li key={p.id} className="flex flex-col gap-1 py-2 text-sm">
                <span className={p.id.endsWith("-total") ? "font-semibold text-frost-900" : "text-frost-900"}>
                  {p.name}
                  {p.retired && <span className="text-frost-600"> (retired)</span>}
                </span>
                <dl className="grid grid-cols-2 gap-x-3 gap-y-0.5 tabular-nums">
                  <dt className="text-frost-600">Runtime</dt>
                  <dd className="text-right">{f.hours(p.onHours)}</dd>
                  <dt className="text-frost-600">Rated</dt>
                  <dd className="text-right">{f.kwh(p.ratedKwh)}</dd>
                  {p.metersEnergy && (
                    <>
                      <dt className="text-frost-600">Metered</dt>
                      <dd className="text-right">{f.kwh(p.meteredKwh)}</dd>
                    </>
                  )}
                  <dt className="text-frost-600">Cost</dt>
                  <dd className="text-right font-medium">{f.money(p.cost)}</dd>
                </dl>
              </li>
            ))}
          </ul>
          <div className="hidden sm:block">
            <table className="w-full text-sm">
              <thead className="text-left text-frost-600">
                <tr>
                  <th scope="col" className="py-2 pr-3 font-medium">
                    Plug
                  </th>
                  <th scope="col" className="py-2 pr-3 text-right font-medium">
                    Runtime
                  </th>
                  <th scope="col" className="py-2 pr-3 text-right font-medium">
                    Rated
                  </th>
                  <th scope="col" className="py-2 pr-3 text-right font-medium">
                    Metered
                  </th>
                  <th scope="col" className="py-2 text-right font-medium">
                    Cost
                  </th>
                </tr>
              </thead>
              <tbody className="tabular-nums">
                {house.plugs.map((p) => (
                  <tr key={p.id} className="border-t border-frost-100">
                    <th scope="row" className="py-2 pr-3 text-left font-normal text-frost-900">
                      {p.name}
                      {p.retired && <span className="text-frost-600"> (retired)</span>}
                      <span className="block text-xs text-frost-600">{p.applianceWatts.toLocaleString("en-GB")} W rated</span>
                    </th>
                    <td className="py-2 pr-3 text-right">{f.hours(p.onHours)}</td>
                    <td className="py-2 pr-3 text-right">{f.kwh(p.ratedKwh)}</td>
                    <td className="py-2 pr-3 text-right">{p.metersEnergy ? f.kwh(p.meteredKwh) : <span className="text-frost-500">does not meter</span>}</td>
                    <td className="py-2 text-right">{f.money(p.cost)}</td>
                  </tr>
                ))}
              </tbody>
              <tfoot className="tabular-nums font-semibold">
                <tr className="border-t border-frost-300">
                  <th scope="row" className="py-2 pr-3 text-left">
                    House total
                  </th>
                  <td className="py-2 pr-3 text-right">{f.hours(house.onHours)}</td>
                  <td className="py-2 pr-3 text-right">{f.kwh(house.ratedKwh)}</td>
                  <td className="py-2 pr-3 text-right">{f.kwh(house.meteredKwh)}</td>
                  <td className="py-2 text-right">{f.money(house.cost)}</td>
                </tr>
              </tfoot>
            </table>
          </div>
        </Card>
      ))}

      <Card as="section" className="flex flex-col gap-2 p-4" aria-labelledby="periods-heading">
        <h2 id="periods-heading" className="text-lg font-semibold text-frost-900">
          By {query.by}
        </h2>
        <div className="max-h-[28rem] overflow-auto">
          <table className="w-full text-sm">
            <thead className="sticky top-0 bg-white text-left text-frost-600">
              <tr>
                <th scope="col" className="py-2 pr-3 font-medium">
                  {query.by === "day" ? "Day" : query.by === "week" ? "Week from" : "Month"}
                </th>
                <th scope="col" className="py-2 pr-3 text-right font-medium">
                  Runtime
                </th>
                <th scope="col" className="py-2 pr-3 text-right font-medium">
                  Energy
                </th>
                <th scope="col" className="py-2 text-right font-medium">
                  Cost
                </th>
              </tr>
            </thead>
            <tbody className="tabular-nums">
              {report.series.filter((b) => b.fromDay <= today).map((b) => (
                <tr key={b.key} className="border-t border-frost-100">
                  <th scope="row" className="py-1.5 pr-3 text-left font-normal">
                    {dayLabel(b.fromDay, { month: query.by === "month" })}
                  </th>
                  <td className="py-1.5 pr-3 text-right">{f.hours(b.onHours)}</td>
                  <td className="py-1.5 pr-3 text-right">{f.kwh(b.costedKwh)}</td>
                  <td className="py-1.5 text-right">{f.money(b.cost)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </Card>

      {report.rates.length > 0 && (
        <Card as="section" className="flex flex-col gap-2 p-4" aria-labelledby="rates-heading">
          <h2 id="rates-heading" className="text-lg font-semibold text-frost-900">
            Tariffs used
          </h2>
          <ul className="flex flex-col gap-1 text-sm text-frost-800">
            {report.tariffs.map((t) => (
              <li key={t.id}>
                <span className="font-medium">{t.name}</span>: {rangeLabel(t.fromDay, t.toDay)}, standing charge {f.price(t.standingChargePerDay)} a day, tax {t.taxPercent} %
              </li>
            ))}
          </ul>
          <table className="w-full text-sm">
            <tbody className="tabular-nums">
              {report.rates.map((r) => (
                <tr key={r.rateKey} className="border-t border-frost-100">
                  <th scope="row" className="py-1.5 pr-3 text-left font-normal">
                    {r.tariff}, {r.label} <span className="text-frost-600">at {f.price(r.pricePerKwh)}/kWh</span>
                  </th>
                  <td className="py-1.5 pr-3 text-right">{f.kwh(r.costedKwh)}</td>
                  <td className="py-1.5 text-right">{f.money(r.cost)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </Card>
      )}

      {can(site.role, "reports.export") && (
        <section aria-labelledby="exports" className="flex flex-col gap-2">
          <h2 id="exports" className="text-lg font-semibold text-frost-900">
            Take it away
          </h2>
          <div className="flex flex-wrap gap-2">
            <a className={buttonClasses("secondary")} href={`${apiBase}/csv?${qs}`} download>
              Spreadsheet (CSV)
            </a>
            <a className={buttonClasses("secondary")} href={`${apiBase}/pdf?${qs}`} download>
              Printable report (PDF)
            </a>
          </div>
        </section>
      )}

      <p className="text-xs text-frost-600">
        Runtime counts the time between each switch on and the next switch off; switches that were withdrawn before the plug carried them out count for
        nothing, and a plug on now is counted up to now. Energy is the appliance&apos;s rated watts × hours on; where a plug meters its own energy, its
        meter is shown beside it and costed instead. Costs include tax and may differ from your supplier&apos;s bill.
      </p>
    </div>
  );
}

function Figure({ label, value, note }: { label: string; value: string; note: string }) {
  return (
    <Card className="flex flex-col gap-0.5 p-3">
      <span className="text-sm text-frost-600">{label}</span>
      <span className="text-xl font-semibold tabular-nums text-frost-950">{value}</span>
      <span className="text-xs text-frost-600">{note}</span>
    </Card>
  );
}
