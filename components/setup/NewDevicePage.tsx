import Link from "next/link";
import type { ReactNode } from "react";
import { Card } from "@/components/ui/Card";
import { Notice } from "@/components/ui/Notice";
import type { SiteWithRole } from "@/db/queries/sites";
import { can } from "@/lib/permissions";
import { PageTitle } from "./PageTitle";

type NewDevicePageProps = { site: SiteWithRole; kind: "plug" | "sensor"; hasHouses: boolean; children: ReactNode };

/** The frame of "add a plug" and "add a sensor": the form for those who may, a plain word for the others. */
export function NewDevicePage({ site, kind, hasHouses, children }: NewDevicePageProps) {
  const body = !can(site.role, "devices.manage") ? (
    <Notice>Plugs and sensors are added by the site’s owners and growers.</Notice>
  ) : !hasHouses ? (
    <Notice>
      A {kind} belongs to a house.{" "}
      <Link href={`/sites/${site.slug}/houses/new`} className="font-semibold underline">
        Add a house first
      </Link>
      .
    </Notice>
  ) : (
    <Card className="p-4 sm:p-5">{children}</Card>
  );
  return (
    <div className="flex flex-col gap-6">
      <PageTitle title={`Add a ${kind}`} back={{ href: `/sites/${site.slug}/devices`, label: "Devices" }}>
        {kind === "plug"
          ? "A smart plug and the appliance it switches. Once added, issue its credential to connect it."
          : "A temperature and humidity sensor. Once added, issue its credential to connect it."}
      </PageTitle>
      {body}
    </div>
  );
}
