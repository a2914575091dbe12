import type { Metadata } from "next";
import { NewDevicePage } from "@/components/setup/NewDevicePage";
import { PlugForm } from "@/components/setup/PlugForm";
import { deviceFormOptions } from "@/components/setup/new-device";
import { getCurrentSite } from "../../../current-site";

type Props = { params: Promise<{ slug: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> };

export const metadata: Metadata = { title: "Add a plug" };

export default async function NewPlugPage({ params, searchParams }: Props) {
  const { site } = await getCurrentSite((await params).slug);
  const { houses, sensors, houseId } = await deviceFormOptions(site.id, (await searchParams).house);
  return (
    <NewDevicePage site={site} kind="plug" hasHouses={houses.length > 0}>
      <PlugForm siteId={site.id} slug={site.slug} mains={site} houses={houses} sensors={sensors} houseId={houseId} />
    </NewDevicePage>
  );
}
