import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { ScheduleEditor } from "@/components/schedules/ScheduleEditor";
import { Notice } from "@/components/ui/Notice";
import { getPlugPlan, requireSchedulePlug, type SchedulePlug } from "@/db/queries/schedules";
import { AppError } from "@/lib/errors";
import { can } from "@/lib/permissions";
import { plugScheduleParams } from "@/lib/schemas/schedule";
import { getCurrentSite } from "../../../current-site";

type Props = { params: Promise<{ slug: string; plugId: string }> };

async function loadPlug(siteId: string, plugId: string): Promise<SchedulePlug | AppError> {
  if (!plugScheduleParams.shape.plugId.safeParse(plugId).success) notFound();
  try {
    return await requireSchedulePlug({ siteId, plugId });
  } catch (error) {
    if (error instanceof AppError && error.code === "not_found") notFound();
    if (error instanceof AppError && error.code === "conflict") return error;
    throw error;
  }
}

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { slug, plugId } = await params;
  const { site } = await getCurrentSite(slug);
  const plug = await loadPlug(site.id, plugId);
  return { title: `${plug instanceof AppError ? "Schedule" : `${plug.name} schedule`} — ${site.name}` };
}

export default async function PlugSchedulePage({ params }: Props) {
  const { slug, plugId } = await params;
  const { site } = await getCurrentSite(slug);
  const plug = await loadPlug(site.id, plugId);
  if (plug instanceof AppError) {
    return (
      <div className="flex flex-col gap-4">
        <h1 className="text-2xl font-semibold text-frost-950">Schedule</h1>
        <Notice tone="caution">{plug.message}</Notice>
        <Link href={`/sites/${site.slug}/schedules`} className="text-leaf-800 underline underline-offset-2">
          All schedules
        </Link>
      </div>
    );
  }
  const { plan, scheduleCount, unreadable } = await getPlugPlan(plug);
  return (
    <ScheduleEditor
      siteId={site.id}
      siteSlug={site.slug}
      timeZone={site.timeZone}
      plug={{ id: plug.id, name: plug.name, houseName: plug.houseName, applianceKind: plug.applianceKind, lowLimitC: plug.lowLimitC, highLimitC: plug.highLimitC }}
      initial={plan}
      scheduleCount={scheduleCount}
      unreadable={unreadable.length}
      canEdit={can(site.role, "schedules.manage")}
    />
  );
}
