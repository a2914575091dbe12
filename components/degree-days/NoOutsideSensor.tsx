import Link from "next/link";
import { Notice } from "@/components/ui/Notice";

/** Degree-days need the outside air: what to do about it, in words. */
export function NoOutsideSensor({ slug, canAdd }: { slug: string; canAdd: boolean }) {
  return (
    <Notice tone="caution">
      <p className="font-semibold">Degree-days need an outside temperature, and this site has no outside sensor.</p>
      <p className="mt-1">
        Mount a sensor outdoors, in shade and out of the rain, clear of the glass and its warmth. Then add it under Devices and set its
        Placement to “Outside”; a sensor you have added already can be switched to “Outside” in its settings.
      </p>
      {canAdd ? (
        <Link
          href={`/sites/${encodeURIComponent(slug)}/devices/sensors/new`}
          className="mt-2 inline-flex min-h-11 items-center font-semibold text-leaf-800 underline decoration-leaf-300 underline-offset-4"
        >
          Add an outside sensor
        </Link>
      ) : (
        <p className="mt-1">An owner or grower of the site can add it.</p>
      )}
    </Notice>
  );
}
