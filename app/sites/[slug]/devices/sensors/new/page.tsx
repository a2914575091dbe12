import type { Metadata } from "next";
import { NewDevicePage } from "@/components/setup/NewDevicePage";
import { SensorForm } from "@/components/setup/SensorForm";
import { deviceFormOptions } from "@/components/setup/new-device";
import { getCurrentSite } from "../../../current-site";

type Props = { params: Promise<{ slug: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> };

export const metadata: Metadata = { title: "Add a sensor" };

export default async function NewSensorPage({ params, searchParams }: Props) {
  const { site } = await getCurrentSite((await params).slug);
  const { houses, houseId } = await deviceFormOptions(site.id, (await searchParams).house);
  return (
    <NewDevicePage site={site} kind="sensor" hasHouses={houses.length > 0}>
      <SensorForm siteId={site.id} slug={site.slug} houses={houses} houseId={houseId} />
    </NewDevicePage>
  );
}
