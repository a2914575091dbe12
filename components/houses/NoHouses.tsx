import { SetupSteps } from "@/components/setup/SetupSteps";
import { Card } from "@/components/ui/Card";
import { can, type Role } from "@/lib/permissions";

/** An empty site: the set-up path for those who may add houses, a plain word for the others. */
export function NoHouses({ slug, siteName, role }: { slug: string; siteName: string; role: Role }) {
  const canManage = can(role, "houses.manage");
  return (
    <Card className="flex flex-col gap-4 px-5 py-6">
      <div>
        <p className="text-lg font-semibold text-frost-900">No houses yet</p>
        <p className="mt-1 text-sm text-frost-600">
          {canManage
            ? `Four steps take ${siteName} from empty to a heated house that Cloche looks after.`
            : `Once an owner or grower adds houses to ${siteName}, each appears here with its plugs, sensors and readings.`}
        </p>
      </div>
      {canManage ? (
        <SetupSteps slug={slug} progress={{ house: null, plug: null, sensor: null, credentials: false }} canManage={canManage} />
      ) : null}
    </Card>
  );
}
