import type { Metadata } from "next";
import { HouseForm } from "@/components/setup/HouseForm";
import { PageTitle } from "@/components/setup/PageTitle";
import { Card } from "@/components/ui/Card";
import { Notice } from "@/components/ui/Notice";
import { can } from "@/lib/permissions";
import { getCurrentSite } from "../../current-site";

type Props = { params: Promise<{ slug: string }> };

export const metadata: Metadata = { title: "Add a house" };

export default async function NewHousePage({ params }: Props) {
  const { site } = await getCurrentSite((await params).slug);
  return (
    <div className="flex flex-col gap-6">
      <PageTitle title="Add a house" back={{ href: `/sites/${site.slug}`, label: "Houses" }}>
        Its size and glazing feed the heat-loss sums; its limits bound every band.
      </PageTitle>
      {can(site.role, "houses.manage") ? (
        <Card className="p-4 sm:p-5">
          <HouseForm siteId={site.id} slug={site.slug} />
        </Card>
      ) : (
        <Notice>Houses are added by the site’s owners and growers.</Notice>
      )}
    </div>
  );
}
