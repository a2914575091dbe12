import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { DeleteHouse } from "@/components/setup/DeleteHouse";
import { DeviceRow } from "@/components/setup/DeviceRow";
import { HouseForm } from "@/components/setup/HouseForm";
import { HouseSummary } from "@/components/setup/HouseSummary";
import { PageTitle } from "@/components/setup/PageTitle";
import { Section } from "@/components/setup/Section";
import { SetupSteps } from "@/components/setup/SetupSteps";
import { buttonClasses } from "@/components/ui/Button";
import { Notice } from "@/components/ui/Notice";
import { getCredentialStatus, getDevicesBySite } from "@/db/queries/devices";
import { getHouse } from "@/db/queries/houses";
import { can } from "@/lib/permissions";
import { getCurrentSite } from "../../current-site";

type Props = { params: Promise<{ slug: string; houseId: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> };

async function loadHouse(props: Props) {
  const { slug, houseId } = await props.params;
  const { site } = await getCurrentSite(slug);
  const house = await getHouse({ siteId: site.id, houseId });
  if (!house) notFound();
  return { site, house };
}

export async function generateMetadata(props: Props): Promise<Metadata> {
  const { house } = await loadHouse(props);
  return { title: house.name };
}

export default async function HousePage(props: Props) {
  const { site, house } = await loadHouse(props);
  const devices = await getDevicesBySite({ siteId: site.id, includeRetired: false });
  const plugs = devices.plugs.filter((p) => p.houseId === house.id);
  const sensors = devices.sensors.filter((s) => s.houseId === house.id);
  const [plug, sensor] = [plugs[0] ?? null, sensors[0] ?? null];
  const statuses = await Promise.all([
    plug ? getCredentialStatus({ siteId: site.id, kind: "plug", deviceId: plug.deviceId }) : null,
    sensor ? getCredentialStatus({ siteId: site.id, kind: "sensor", deviceId: sensor.deviceId }) : null,
  ]);
  const credentials = Boolean(plug && sensor) && statuses.every((s) => s && !s.revokedAt);
  const canManageHouse = can(site.role, "houses.manage");
  const canManageDevices = can(site.role, "devices.manage");
  const now = devices.at;
  const deviceLinks = (kind: "plugs" | "sensors") => `/sites/${site.slug}/devices/${kind}/new?house=${house.id}`;

  return (
    <div className="flex flex-col gap-6">
      <PageTitle title={house.name} back={{ href: `/sites/${site.slug}`, label: "Houses" }} />
      {(await props.searchParams).added === "1" ? <Notice>House added. Next, its heater plug.</Notice> : null}

      {canManageDevices && !(plug && sensor && credentials) ? (
        <Section title="Getting this house working">
          <SetupSteps slug={site.slug} progress={{ house, plug, sensor, credentials }} canManage={canManageDevices} />
        </Section>
      ) : null}

      <Section title="Plugs">
        {plugs.length ? (
          <ul className="flex flex-col gap-2">
            {plugs.map((p) => (
              <DeviceRow key={p.id} device={p} slug={site.slug} now={now} timeZone={site.timeZone} />
            ))}
          </ul>
        ) : (
          <p className="text-sm text-frost-600">No plugs in this house.</p>
        )}
        {canManageDevices ? (
          <Link href={deviceLinks("plugs")} className={buttonClasses("secondary", "self-start")}>
            Add a plug here
          </Link>
        ) : null}
      </Section>

      <Section title="Sensors">
        {sensors.length ? (
          <ul className="flex flex-col gap-2">
            {sensors.map((s) => (
              <DeviceRow key={s.id} device={s} slug={site.slug} now={now} timeZone={site.timeZone} />
            ))}
          </ul>
        ) : (
          <p className="text-sm text-frost-600">No sensors in this house.</p>
        )}
        {canManageDevices ? (
          <Link href={deviceLinks("sensors")} className={buttonClasses("secondary", "self-start")}>
            Add a sensor here
          </Link>
        ) : null}
      </Section>

      <Section title={canManageHouse ? "Edit the house" : "About the house"}>
        {canManageHouse ? <HouseForm siteId={site.id} slug={site.slug} house={house} /> : <HouseSummary house={house} />}
      </Section>

      {canManageHouse ? (
        <Section title="Remove the house">
          <DeleteHouse siteId={site.id} slug={site.slug} house={house} plugCount={plugs.length} sensorCount={sensors.length} />
        </Section>
      ) : null}
    </div>
  );
}
