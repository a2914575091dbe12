"use client";

import { useParams } from "next/navigation";
import useSWR from "swr";
import { SetupSteps } from "@/components/setup/SetupSteps";
import { Card } from "@/components/ui/Card";
import { can, type Role } from "@/lib/permissions";

type MySites = { sites: { slug: string; role: Role }[] };

const fetchSites = async (url: string): Promise<MySites> => {
  const response = await fetch(url, { headers: { accept: "application/json" } });
  if (!response.ok) throw new Error(`status ${response.status}`);
  return (await response.json()) as MySites;
};

/** An empty site: the set-up path for those who may add houses, a plain word for the others. */
export function NoHouses({ siteName }: { siteName: string }) {
  const { slug } = useParams<{ slug: string }>();
  const { data } = useSWR("/api/sites", fetchSites);
  const role = data?.sites.find((s) => s.slug === slug)?.role;
  const canManage = can(role, "houses.manage");

  return (
    <Card className="flex flex-col gap-4 px-5 py-6">
      <div>
        <p className="text-lg font-semibold text-frost-900">No houses yet</p>
        <p className="mt-1 text-sm text-frost-600">
          {role && !canManage
            ? `Once an owner or grower adds houses to ${siteName}, each appears here with its plugs, sensors and readings.`
            : `Four steps take ${siteName} from empty to a heated house that Cloche looks after.`}
        </p>
      </div>
      {role && !canManage ? null : (
        <SetupSteps slug={slug} progress={{ house: null, plug: null, sensor: null, credentials: false }} canManage={canManage} />
      )}
    </Card>
  );
}
