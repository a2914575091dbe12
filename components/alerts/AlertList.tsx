"use client";

import { useEffect, useState } from "react";
import useSWRInfinite from "swr/infinite";
import { getJson } from "@/components/members/api";
import { Button } from "@/components/ui/Button";
import { Field } from "@/components/ui/Field";
import { Notice } from "@/components/ui/Notice";
import { Select } from "@/components/ui/Select";
import { ALERT_KINDS, ALERT_KIND_LABELS } from "@/lib/domain";
import type { AlertListStatus } from "@/lib/schemas/alert-list";
import { AlertCard } from "./AlertCard";
import type { AlertJson } from "./alert-words";

type Page = { alerts: AlertJson[]; nextCursor: string | null };
type Filters = { houseId: string; kind: string };

/** How often the open alerts are read again while the page is open. */
const OPEN_REFRESH_MS = 15_000;

function useNow(): Date {
  const [now, setNow] = useState(() => new Date());
  useEffect(() => {
    const timer = setInterval(() => setNow(new Date()), 30_000);
    return () => clearInterval(timer);
  }, []);
  return now;
}

function useAlertPages(siteId: string, status: AlertListStatus, filters: Filters) {
  return useSWRInfinite<Page>(
    (_index, previous: Page | null) => {
      if (previous && !previous.nextCursor) return null;
      const query = new URLSearchParams({ status });
      if (filters.houseId) query.set("houseId", filters.houseId);
      if (filters.kind) query.set("kind", filters.kind);
      if (previous?.nextCursor) query.set("cursor", previous.nextCursor);
      return `/api/sites/${siteId}/alerts?${query}`;
    },
    getJson,
    status === "open" ? { refreshInterval: OPEN_REFRESH_MS, revalidateFirstPage: true } : { revalidateFirstPage: false },
  );
}

type Props = {
  siteId: string;
  timeZone: string;
  houses: { id: string; name: string }[];
  canAcknowledge: boolean;
};

/** The site's alerts: open ones first (read again every 15 s), then past ones, by house and kind. */
export function AlertList({ siteId, timeZone, houses, canAcknowledge }: Props) {
  const [filters, setFilters] = useState<Filters>({ houseId: "", kind: "" });
  const now = useNow();
  const open = useAlertPages(siteId, "open", filters);
  const past = useAlertPages(siteId, "past", filters);
  const filtered = Boolean(filters.houseId || filters.kind);

  return (
    <div className="flex flex-col gap-6">
      <div className="grid gap-3 sm:grid-cols-2">
        <Field label="House">
          {(c) => (
            <Select {...c} value={filters.houseId} onChange={(e) => setFilters({ ...filters, houseId: e.target.value })}>
              <option value="">Every house</option>
              {houses.map((h) => (
                <option key={h.id} value={h.id}>
                  {h.name}
                </option>
              ))}
            </Select>
          )}
        </Field>
        <Field label="Kind">
          {(c) => (
            <Select {...c} value={filters.kind} onChange={(e) => setFilters({ ...filters, kind: e.target.value })}>
              <option value="">Every kind</option>
              {ALERT_KINDS.map((k) => (
                <option key={k} value={k}>
                  {ALERT_KIND_LABELS[k]}
                </option>
              ))}
            </Select>
          )}
        </Field>
      </div>

      <Section
        title="Open now"
        pages={open}
        empty={filtered ? "Nothing open matches these filters." : "Nothing is wrong at the moment. New alerts appear here within 15 seconds."}
        render={(alert) => (
          <AlertCard key={alert.id} alert={alert} siteId={siteId} timeZone={timeZone} now={now} canAcknowledge={canAcknowledge} onChanged={() => void open.mutate()} />
        )}
      />
      <Section
        title="Past alerts"
        pages={past}
        empty={filtered ? "No past alerts match these filters." : "No alerts have closed yet."}
        render={(alert) => <AlertCard key={alert.id} alert={alert} siteId={siteId} timeZone={timeZone} now={now} canAcknowledge={false} />}
      />
    </div>
  );
}

function Section({
  title,
  pages,
  empty,
  render,
}: {
  title: string;
  pages: ReturnType<typeof useAlertPages>;
  empty: string;
  render: (alert: AlertJson) => React.ReactNode;
}) {
  const { data, error, size, setSize, isValidating } = pages;
  const alerts = data?.flatMap((p) => p.alerts) ?? [];
  const more = Boolean(data?.at(-1)?.nextCursor);
  const headingId = `${title.toLowerCase().replace(/\W+/g, "-")}-heading`;
  return (
    <section aria-labelledby={headingId} className="flex flex-col gap-3">
      <h2 id={headingId} className="text-lg font-semibold text-frost-950">
        {title}
        {data ? <span className="font-normal text-frost-600"> ({alerts.length}{more ? "+" : ""})</span> : null}
      </h2>
      {error ? <Notice tone="error">{(error as Error).message}</Notice> : null}
      {!data && !error ? <p className="text-sm text-frost-600">Loading…</p> : null}
      {data && alerts.length === 0 ? <Notice>{empty}</Notice> : null}
      {alerts.length ? <ul className="flex flex-col gap-3">{alerts.map(render)}</ul> : null}
      {more ? (
        <Button variant="secondary" className="w-full" pending={isValidating && size > (data?.length ?? 0)} pendingLabel="Loading…" onClick={() => void setSize(size + 1)}>
          Show older
        </Button>
      ) : null}
    </section>
  );
}
