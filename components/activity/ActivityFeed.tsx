"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import useSWRInfinite from "swr/infinite";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { Field } from "@/components/ui/Field";
import { Notice } from "@/components/ui/Notice";
import { Select } from "@/components/ui/Select";
import { TextInput } from "@/components/ui/TextInput";
import { getJson } from "@/components/members/api";
import { describeAuditAction, describeAuditEntity } from "@/lib/audit";
import { auditFilterSchema } from "@/lib/schemas/audit";
import { ActivityEntry, type AuditEntryJson } from "./ActivityEntry";

type Page = { entries: AuditEntryJson[]; nextCursor: string | null };
type Choices = { people: { id: string; name: string }[]; entityTypes: string[]; actions: string[] };
type Filters = { userId: string; entityType: string; action: string; from: string; to: string };

const EMPTY: Filters = { userId: "", entityType: "", action: "", from: "", to: "" };

function queryOf(filters: Filters, cursor: string | null): string {
  const query = new URLSearchParams();
  for (const [key, value] of Object.entries(filters)) if (value) query.set(key, value);
  if (cursor) query.set("cursor", cursor);
  return query.toString();
}

/** Empty text is "no filter" for the shared schema. */
const resolver = zodResolver(auditFilterSchema);

export function ActivityFeed({ siteId, timeZone, choices }: { siteId: string; timeZone: string; choices: Choices }) {
  const [filters, setFilters] = useState<Filters>(EMPTY);
  const {
    register,
    handleSubmit,
    reset,
    formState: { errors },
  } = useForm<Filters>({
    defaultValues: EMPTY,
    resolver: async (values, context, options) => {
      const present = Object.fromEntries(Object.entries(values).filter(([, v]) => v !== ""));
      const result = await resolver(present as never, context, options as never);
      return Object.keys(result.errors).length ? { values: {}, errors: result.errors } : { values, errors: {} };
    },
  });

  const { data, error, size, setSize, isValidating } = useSWRInfinite<Page>(
    (index, previous: Page | null) => {
      if (previous && !previous.nextCursor) return null;
      return `/api/sites/${siteId}/audit?${queryOf(filters, previous?.nextCursor ?? null)}`;
    },
    getJson,
  );
  const entries = data?.flatMap((page) => page.entries) ?? [];
  const more = Boolean(data?.at(-1)?.nextCursor);
  const loadingMore = isValidating && size > (data?.length ?? 0);

  return (
    <div className="flex flex-col gap-6">
      <Card as="section" className="p-4 sm:p-6" aria-labelledby="filters-title">
        <h2 id="filters-title" className="mb-4 text-lg font-semibold text-frost-950">
          Filter
        </h2>
        <form
          noValidate
          onSubmit={handleSubmit((values) => setFilters(values))}
          className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3"
        >
          <Field label="Who" error={errors.userId?.message}>
            {(control) => (
              <Select {...control} {...register("userId")}>
                <option value="">Everyone</option>
                {choices.people.map((p) => (
                  <option key={p.id} value={p.id}>
                    {p.name}
                  </option>
                ))}
              </Select>
            )}
          </Field>
          <Field label="What" error={errors.entityType?.message}>
            {(control) => (
              <Select {...control} {...register("entityType")}>
                <option value="">Everything</option>
                {choices.entityTypes.map((t) => (
                  <option key={t} value={t}>
                    {describeAuditEntity(t)}
                  </option>
                ))}
              </Select>
            )}
          </Field>
          <Field label="Change" error={errors.action?.message}>
            {(control) => (
              <Select {...control} {...register("action")}>
                <option value="">Any change</option>
                {choices.actions.map((a) => (
                  <option key={a} value={a}>
                    {describeAuditAction(a)}
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
          <div className="flex flex-wrap items-end gap-2">
            <Button type="submit">Show</Button>
            <Button
              variant="secondary"
              onClick={() => {
                reset(EMPTY);
                setFilters(EMPTY);
              }}
            >
              Clear
            </Button>
          </div>
        </form>
      </Card>

      <Card as="section" className="p-4 sm:p-6" aria-labelledby="changes-title" aria-busy={isValidating}>
        <h2 id="changes-title" className="text-lg font-semibold text-frost-950">
          Changes, newest first
        </h2>
        {error ? <Notice tone="error">{(error as Error).message}</Notice> : null}
        {!data && !error ? <p className="mt-2 text-sm text-frost-600">Loading…</p> : null}
        {data && entries.length === 0 ? <p className="mt-2 text-sm text-frost-700">No changes match these filters.</p> : null}
        <ul className="divide-y divide-frost-200">
          {entries.map((entry) => (
            <ActivityEntry key={entry.id} entry={entry} timeZone={timeZone} />
          ))}
        </ul>
        {more ? (
          <Button variant="secondary" className="mt-4 w-full" pending={loadingMore} pendingLabel="Loading…" onClick={() => void setSize(size + 1)}>
            Show older changes
          </Button>
        ) : null}
      </Card>
    </div>
  );
}
