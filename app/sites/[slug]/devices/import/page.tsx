import type { Metadata } from "next";
import { PageTitle } from "@/components/setup/PageTitle";
import { Section } from "@/components/setup/Section";
import { ReadingImport } from "@/components/readings-import/ReadingImport";
import { Notice } from "@/components/ui/Notice";
import { getImportSensorsBySite, getReadingImportsBySite } from "@/db/queries/reading-imports";
import { can } from "@/lib/permissions";
import { getCurrentSite } from "../../current-site";

type Props = { params: Promise<{ slug: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> };

export const metadata: Metadata = { title: "Import sensor history" };

export default async function ReadingImportPage({ params, searchParams }: Props) {
  const { site } = await getCurrentSite((await params).slug);
  const wanted = (await searchParams).sensor;
  const [sensors, imports] = await Promise.all([getImportSensorsBySite({ siteId: site.id }), getReadingImportsBySite({ siteId: site.id })]);
  const working = sensors.filter((s) => !s.retiredAt || s.id === wanted);
  const when = new Intl.DateTimeFormat("en-GB", { timeZone: site.timeZone, day: "numeric", month: "short", year: "numeric", hour: "2-digit", minute: "2-digit" });
  const day = new Intl.DateTimeFormat("en-GB", { timeZone: site.timeZone, day: "numeric", month: "short", year: "numeric" });

  return (
    <div className="flex flex-col gap-6">
      <PageTitle title="Import sensor history" back={{ href: `/sites/${site.slug}/devices`, label: "Devices" }}>
        Readings a thermometer kept before Cloche heard it, from the CSV file its own app exports. They join the sensor’s per-minute history: the house charts and the
        degree-days use them like readings heard live.
      </PageTitle>
      {!can(site.role, "readings.import") ? (
        <Notice>An owner or grower imports sensor history.</Notice>
      ) : working.length === 0 ? (
        <Notice>This site has no sensor yet. Add the sensor first; its history can then be imported.</Notice>
      ) : (
        <Section title="From a file">
          <ReadingImport
            siteId={site.id}
            siteZone={site.timeZone}
            sensors={working.map(({ id, name, houseName, placement }) => ({ id, name, houseName, placement }))}
            sensorId={typeof wanted === "string" && working.some((s) => s.id === wanted) ? wanted : undefined}
          />
        </Section>
      )}
      {imports.length ? (
        <Section title="Imported before">
          <ul className="flex flex-col divide-y divide-frost-100">
            {imports.map((i) => (
              <li key={i.id} className="flex flex-col gap-0.5 py-2.5 text-sm">
                <span className="font-medium text-frost-900">
                  {i.fileName} → {i.sensorName} ({i.houseName})
                </span>
                <span className="text-frost-600">
                  {i.firstAt && i.lastAt ? `${day.format(i.firstAt)} – ${day.format(i.lastAt)} · ` : ""}
                  {i.rowsRead.toLocaleString("en-GB")} rows, {i.minutesAdded.toLocaleString("en-GB")} minutes added, {i.minutesAlreadyThere.toLocaleString("en-GB")} already there · {when.format(i.importedAt)}
                  {i.importedByName ? ` by ${i.importedByName}` : ""}
                </span>
              </li>
            ))}
          </ul>
        </Section>
      ) : null}
    </div>
  );
}
