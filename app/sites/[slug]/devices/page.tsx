import type { Metadata } from "next";
import Link from "next/link";
import { DeviceList } from "@/components/setup/DeviceList";
import { PageTitle } from "@/components/setup/PageTitle";
import { buttonClasses } from "@/components/ui/Button";
import { Notice } from "@/components/ui/Notice";
import { getDevicesBySite } from "@/db/queries/devices";
import { getHousesBySite } from "@/db/queries/houses";
import { can } from "@/lib/permissions";
import { getCurrentSite } from "../current-site";

type Props = { params: Promise<{ slug: string }> };

export const metadata: Metadata = { title: "Devices" };

export default async function DevicesPage({ params }: Props) {
  const { site } = await getCurrentSite((await params).slug);
  const [houses, devices] = await Promise.all([getHousesBySite({ siteId: site.id }), getDevicesBySite({ siteId: site.id, includeRetired: false })]);
  const canManage = can(site.role, "devices.manage");
  return (
    <div className="flex flex-col gap-6">
      <PageTitle title="Devices">Plugs and sensors of {site.name}, by house, and whether Cloche hears them.</PageTitle>
      {canManage && houses.length ? (
        <div className="flex flex-wrap gap-2">
          <Link href={`/sites/${site.slug}/devices/plugs/new`} className={buttonClasses("primary")}>
            Add a plug
          </Link>
          <Link href={`/sites/${site.slug}/devices/sensors/new`} className={buttonClasses("secondary")}>
            Add a sensor
          </Link>
        </div>
      ) : null}
      {houses.length === 0 ? (
        <Notice>
          Devices belong to a house.{" "}
          {can(site.role, "houses.manage") ? (
            <Link href={`/sites/${site.slug}/houses/new`} className="font-semibold underline">
              Add a house first
            </Link>
          ) : (
            "An owner or grower adds the houses first."
          )}
        </Notice>
      ) : (
        <DeviceList
          siteId={site.id}
          slug={site.slug}
          timeZone={site.timeZone}
          houses={houses.map(({ id, name }) => ({ id, name }))}
          initial={JSON.parse(JSON.stringify(devices))}
          renderedAt={devices.at.getTime()}
        />
      )}
    </div>
  );
}
