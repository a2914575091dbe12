"use client";

import { useRouter } from "next/navigation";
import { ConfirmButton } from "./ConfirmButton";

type DeleteHouseProps = { siteId: string; slug: string; house: { id: string; name: string }; plugCount: number; sensorCount: number };

const count = (n: number, one: string) => `${n} ${one}${n === 1 ? "" : "s"}`;

export function DeleteHouse({ siteId, slug, house, plugCount, sensorCount }: DeleteHouseProps) {
  const router = useRouter();
  return (
    <ConfirmButton
      label="Remove this house"
      confirmLabel={`Remove “${house.name}”`}
      url={`/api/sites/${siteId}/houses/${house.id}`}
      method="DELETE"
      warning={
        <p>
          “{house.name}” is removed with its {count(plugCount, "plug")} and {count(sensorCount, "sensor")}, their schedules and their
          history. Their credentials stop working. This cannot be undone; to keep the history, retire the devices instead.
        </p>
      }
      onDone={() => {
        router.push(`/sites/${slug}`);
        router.refresh();
      }}
    />
  );
}
