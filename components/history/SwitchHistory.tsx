"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useEffect, useRef, useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import useSWRInfinite from "swr/infinite";
import { Button, buttonClasses } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { Field } from "@/components/ui/Field";
import { Notice } from "@/components/ui/Notice";
import { Select } from "@/components/ui/Select";
import { TextInput } from "@/components/ui/TextInput";
import { getJson } from "@/components/members/api";
import { SWITCH_CAUSES } from "@/lib/domain";
import { switchFilterSchema } from "@/lib/schemas/switch-history";
import { SwitchList } from "./SwitchList";
import { causeLabel, type SwitchJson } from "./switch-text";

type Page = { rows: SwitchJson[]; nextCursor: string | null };
type Choices = {
  houses: { id: string; name: string }[];
  plugs: { id: string; name: string; houseId: string; retired: boolean }[];
  people: { id: string; name: string }[];
};
type Filters = { houseId: string; plugId: string; cause: string; userId: string; from: string; to: string };

const EMPTY: Filters = { houseId: "", plugId: "", cause: "", userId: "", from: "", to: "" };

function queryOf(filters: Filters, cursor: string | null = null): string {
  const query = new URLSearchParams();
  for (const [key, value] of Object.entries(filters)) if (value) query.set(key, value);
  if (cursor) query.set("cursor", cursor);
  return query.toString();
}

/** Empty text is "no filter" for the shared schema. */
const resolver = zodResolver(switchFilterSchema);

export function SwitchHistory({ siteId, timeZone, choices, canExport }: { siteId: string; timeZone: string; choices: Choices; canExport: boolean }) {
  const [filters, setFilters] = useState<Filters>(EMPTY);
  const {
    register,
    handleSubmit,
    reset,
    control,
    getValues,
    setValue,
    formState: { errors },
  } = useForm<Filters>({
    defaultValues: EMPTY,
    resolver: async (values, context, options) => {
      const present = Object.fromEntries(Object.entries(values).filter(([, v]) => v !== ""));
      const result = await resolver(present as never, context, options as never);
      return Object.keys(result.errors).length ? { values: {}, errors: result.errors } : { values, errors: {} };
    },
  });
  const houseId = useWatch({ control, name: "houseId" });
  const plugsShown = houseId ? choices.plugs.filter((p) => p.houseId === houseId) : choices.plugs;

  const { data, error, size, setSize, isValidating } = useSWRInfinite<Page>(
    (index, previous: Page | null) => {
      if (previous && !previous.nextCursor) return null;
      return `/api/sites/${siteId}/switches?${queryOf(filters, previous?.nextCursor ?? null)}`;
    },
    getJson,
    { revalidateFirstPage: false },
  );
  const rows = data?.flatMap((page) => page.rows) ?? [];
  const more = Boolean(data?.at(-1)?.nextCursor);
  const loadingMore = isValidating && size > (data?.length ?? 0);
  const filtered = queryOf(filters) !== "";
  const activeFilters = Object.values(filters).filter(Boolean).length;
  // The filters start folded on a phone, so the switches are on the first screen; open on a desk.
  const filterBox = useRef<HTMLDetailsElement>(null);
  useEffect(() => {
    if (filterBox.current && window.matchMedia("(min-width: 640px)").matches) filterBox.current.open = true;
  }, []);

  return (
    <div className="flex flex-col gap-6">
      <Card as="section" className="p-4 sm:p-6" aria-labelledby="history-filters-title">
        <details ref={filterBox} className="group">
          <summary className="flex min-h-11 cursor-pointer items-center justify-between gap-3 rounded-lg">
            <h2 id="history-filters-title" className="text-lg font-semibold text-frost-950">
              Filter{canExport ? " and download" : ""}
            </h2>
            <span className="flex shrink-0 items-center gap-2 whitespace-nowrap text-sm text-frost-700">
              {activeFilters ? `${activeFilters} filter${activeFilters > 1 ? "s" : ""} on` : "All switches"}
              <span aria-hidden="true" className="text-lg leading-none transition-transform group-open:rotate-180">
                ▾
              </span>
            </span>
          </summary>
          <form noValidate onSubmit={handleSubmit((values) => setFilters(values))} className="mt-4 grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
            <Field label="House" error={errors.houseId?.message}>
              {(control) => (
                <Select
                  {...control}
                  {...register("houseId", {
                    onChange: (event: { target: { value: string } }) => {
                      const plug = choices.plugs.find((p) => p.id === getValues("plugId"));
                      if (plug && event.target.value && plug.houseId !== event.target.value) setValue("plugId", "");
                    },
                  })}
                >
                  <option value="">Every house</option>
                  {choices.houses.map((h) => (
                    <option key={h.id} value={h.id}>
                      {h.name}
                    </option>
                  ))}
                </Select>
              )}
            </Field>
            <Field label="Plug" error={errors.plugId?.message}>
              {(control) => (
                <Select {...control} {...register("plugId")}>
                  <option value="">Every plug</option>
                  {plugsShown.map((p) => (
                    <option key={p.id} value={p.id}>
                      {p.name}
                      {p.retired ? " (retired)" : ""}
                    </option>
                  ))}
                </Select>
              )}
            </Field>
            <Field label="Why" error={errors.cause?.message}>
              {(control) => (
                <Select {...control} {...register("cause")}>
                  <option value="">Any reason</option>
                  {SWITCH_CAUSES.map((c) => (
                    <option key={c} value={c}>
                      {causeLabel(c)}
                    </option>
                  ))}
                </Select>
              )}
            </Field>
            <Field label="Switched by" hint="People appear here once they have overridden a plug" error={errors.userId?.message}>
              {(control) => (
                <Select {...control} {...register("userId")}>
                  <option value="">Anyone or the controller</option>
                  {choices.people.map((p) => (
                    <option key={p.id} value={p.id}>
                      {p.name}
                    </option>
                  ))}
                </Select>
              )}
            </Field>
            <Field label="From" hint={`A day in ${timeZone}`} error={errors.from?.message}>
              {(control) => <TextInput {...control} type="date" {...register("from")} />}
            </Field>
            <Field label="To" hint="Included" error={errors.to?.message}>
              {(control) => <TextInput {...control} type="date" {...register("to")} />}
            </Field>
            <div className="flex flex-wrap items-end gap-2 sm:col-span-2 lg:col-span-3">
              <Button type="submit">Show switches</Button>
              <Button
                variant="secondary"
                onClick={() => {
                  reset(EMPTY);
                  setFilters(EMPTY);
                }}
              >
                Clear filters
              </Button>
              {canExport && rows.length > 0 ? (
                <a href={`/api/sites/${siteId}/switches/export?${queryOf(filters)}`} download className={buttonClasses("quiet", "sm:ml-auto")}>
                  Download CSV{filtered ? " of these switches" : ""}
                </a>
              ) : null}
            </div>
          </form>
        </details>
      </Card>

      <Card as="section" className="p-4 sm:p-6" aria-labelledby="history-list-title" aria-busy={isValidating}>
        <h2 id="history-list-title" className="text-lg font-semibold text-frost-950">
          Switches, newest first
        </h2>
        {error ? (
          <div className="mt-3">
            <Notice tone="error">{(error as Error).message}</Notice>
          </div>
        ) : null}
        {!data && !error ? <p className="mt-3 text-sm text-frost-600">Loading…</p> : null}
        {data && rows.length === 0 ? (
          <div className="mt-3">
            <Notice>
              {filtered
                ? "No switches match these filters. Widen the dates, or clear a filter to see more."
                : "No switches yet. Each time the controller switches a plug it appears here; if nothing shows after a day, check that the plugs are online on the Devices page."}
            </Notice>
          </div>
        ) : null}
        {rows.length ? <SwitchList rows={rows} timeZone={timeZone} /> : null}
        {more ? (
          <Button variant="secondary" className="mt-4 w-full" pending={loadingMore} pendingLabel="Loading…" onClick={() => void setSize(size + 1)}>
            Load older switches
          </Button>
        ) : rows.length ? (
          <p className="mt-4 text-center text-sm text-frost-600">That is every switch{filtered ? " these filters cover" : ""}.</p>
        ) : null}
      </Card>
    </div>
  );
}
