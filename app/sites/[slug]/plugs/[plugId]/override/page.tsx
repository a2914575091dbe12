import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { OverrideScreen } from "@/components/override/OverrideScreen";
import type { OverridePanelJson } from "@/components/override/panel-data";
import { getOverridePanel, requirePlugOfSite } from "@/db/queries/overrides";
import { AppError } from "@/lib/errors";
import { can } from "@/lib/permissions";
import { plugParams } from "@/lib/schemas/override";
import { getCurrentSite } from "../../../current-site";

type Props = { params: Promise<{ slug: string; plugId: string }> };

async function loadPlug(slug: string, plugId: string) {
  const { site } = await getCurrentSite(slug);
  if (!plugParams.shape.plugId.safeParse(plugId).success) notFound();
  try {
    return { site, plug: await requirePlugOfSite({ siteId: site.id, plugId }) };
  } catch (error) {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  }
}

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { slug, plugId } = await params;
  const { plug } = await loadPlug(slug, plugId);
  return { title: `Override ${plug.name}` };
}

export default async function OverridePage({ params }: Props) {
  const { slug, plugId } = await params;
  const { site, plug } = await loadPlug(slug, plugId);
  const panel = JSON.parse(JSON.stringify(await getOverridePanel({ plug, timeZone: site.timeZone }))) as OverridePanelJson;

  return (
    <div className="mx-auto flex max-w-md flex-col gap-5">
      <Link href={`/sites/${site.slug}`} className="inline-flex min-h-11 items-center text-base font-medium text-leaf-800 underline">
        ← Back to the houses
      </Link>
      <div>
        <h1 className="text-3xl font-bold text-frost-950">{plug.name}</h1>
        <p className="mt-1 text-lg text-frost-700">{plug.houseName}</p>
      </div>
      <OverrideScreen
        siteId={site.id}
        timeZone={site.timeZone}
        initial={panel}
        canCreate={can(site.role, "overrides.create")}
        canCancel={can(site.role, "overrides.cancel")}
      />
    </div>
  );
}
