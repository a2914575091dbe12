"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/Button";
import { Notice } from "@/components/ui/Notice";
import { sendJson } from "@/lib/client/api";

type FollowSensorProps = { siteId: string; sensorId: string; plugs: { id: string; name: string }[] };

/** Plugs of the sensor's house that follow no sensor yet: one press each lets their bands follow it. */
export function FollowSensor({ siteId, sensorId, plugs }: FollowSensorProps) {
  const router = useRouter();
  const [pending, setPending] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);

  async function follow(plugId: string) {
    setPending(plugId);
    setError(null);
    const result = await sendJson(`/api/sites/${siteId}/plugs/${plugId}`, "PATCH", { sensorId });
    setPending(null);
    if (!result.ok) return setError(result.error.message);
    router.refresh();
  }

  return (
    <div className="flex flex-col gap-2">
      <p className="text-sm text-frost-800">These plugs in the same house follow no sensor yet, so their temperature bands cannot work:</p>
      <ul className="flex flex-col gap-2">
        {plugs.map((p) => (
          <li key={p.id} className="flex flex-wrap items-center justify-between gap-2 rounded-lg border border-frost-200 px-4 py-2">
            <span className="font-medium text-frost-950">{p.name}</span>
            <Button variant="secondary" pending={pending === p.id} pendingLabel="Saving…" onClick={() => follow(p.id)}>
              Follow this sensor
            </Button>
          </li>
        ))}
      </ul>
      {error ? <Notice tone="error">{error}</Notice> : null}
    </div>
  );
}
