"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import { Button } from "@/components/ui/Button";
import { Notice } from "@/components/ui/Notice";
import type { ErrorBody } from "@/lib/errors";
import { newSiteSchema } from "@/lib/schemas/account";
import { DEFAULT_CURRENCY } from "./CurrencySelect";
import { SiteFields } from "./SiteFields";
import { useTimeZoneDefault } from "./use-time-zone-default";

const FIELDS = ["siteName", "timeZone", "currency"] as const;
type SiteField = (typeof FIELDS)[number];
const isField = (name: string): name is SiteField => (FIELDS as readonly string[]).includes(name);

type Created = { site: { id: string; slug: string } };

export function NewSiteForm() {
  const router = useRouter();
  const [serverError, setServerError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    setValue,
    control,
    formState: { errors, isSubmitting, dirtyFields },
  } = useForm({
    resolver: zodResolver(newSiteSchema),
    defaultValues: { siteName: "", timeZone: "UTC", currency: DEFAULT_CURRENCY },
  });
  const timeZone = useWatch({ control, name: "timeZone" });
  const zones = useTimeZoneDefault(Boolean(dirtyFields.timeZone), (zone) => setValue("timeZone", zone));

  const onSubmit = handleSubmit(async (values) => {
    setServerError(null);
    let response: Response;
    try {
      response = await fetch("/api/sites", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify(values),
      });
    } catch {
      setServerError("Could not reach Cloche. Check your connection and try again.");
      return;
    }
    const body = (await response.json().catch(() => null)) as Created | ErrorBody | null;
    if (!response.ok || !body || !("site" in body)) {
      const error = body && "error" in body ? body.error : null;
      const fields = Object.entries(error?.fields ?? {}).filter(([name]) => isField(name));
      for (const [name, message] of fields) setError(name as SiteField, { message });
      if (fields.length === 0) setServerError(error?.message ?? "Could not create the site. Please try again.");
      return;
    }
    router.push(`/sites/${body.site.slug}`);
    router.refresh();
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {serverError ? <Notice tone="error">{serverError}</Notice> : null}
      <SiteFields
        register={{ siteName: register("siteName"), timeZone: register("timeZone"), currency: register("currency") }}
        errors={{ siteName: errors.siteName?.message, timeZone: errors.timeZone?.message, currency: errors.currency?.message }}
        timeZone={timeZone}
        zones={zones}
      />
      <Button type="submit" pending={isSubmitting} pendingLabel="Creating the site…" className="mt-2 w-full sm:w-auto sm:self-start">
        Create site
      </Button>
    </form>
  );
}
