"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import { DEFAULT_CURRENCY } from "@/components/site/CurrencySelect";
import { SiteFields } from "@/components/site/SiteFields";
import { useTimeZoneDefault } from "@/components/site/use-time-zone-default";
import { Button } from "@/components/ui/Button";
import { Field } from "@/components/ui/Field";
import { Notice } from "@/components/ui/Notice";
import { TextInput } from "@/components/ui/TextInput";
import { authClient } from "@/lib/client/auth-client";
import { signUpSchema, type SignUpInput } from "@/lib/schemas/account";
import { authErrorMessage, fieldOfMessage } from "./auth-error-message";

type SignUpBody = Parameters<typeof authClient.signUp.email>[0] & Pick<SignUpInput, "siteName" | "timeZone" | "currency">;

const FIELDS = ["name", "email", "password", "siteName", "timeZone", "currency"] as const;
const isField = (name: string): name is (typeof FIELDS)[number] => (FIELDS as readonly string[]).includes(name);

export function SignUpForm() {
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
    resolver: zodResolver(signUpSchema),
    defaultValues: { name: "", email: "", password: "", siteName: "", timeZone: "UTC", currency: DEFAULT_CURRENCY },
  });
  const timeZone = useWatch({ control, name: "timeZone" });
  const zones = useTimeZoneDefault(Boolean(dirtyFields.timeZone), (zone) => setValue("timeZone", zone));

  const onSubmit = handleSubmit(async (values) => {
    setServerError(null);
    // The site fields are read by the server's sign-up hook; the client's types don't know them.
    const body: SignUpBody = values;
    try {
      const { error } = await authClient.signUp.email(body);
      if (error) {
        const named = error.status === 400 ? fieldOfMessage(error.message) : null;
        if (named && isField(named.field)) setError(named.field, { message: named.message }, { shouldFocus: true });
        else setServerError(authErrorMessage(error, "Could not create your account."));
        return;
      }
    } catch {
      setServerError(authErrorMessage({}, "Could not create your account."));
      return;
    }
    router.push("/");
    router.refresh();
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-6">
      {serverError ? <Notice tone="error">{serverError}</Notice> : null}
      <fieldset className="flex flex-col gap-4">
        <legend className="mb-3 text-sm font-semibold uppercase tracking-wide text-frost-600">You</legend>
        <Field label="Name" error={errors.name?.message}>
          {(control) => <TextInput {...control} autoComplete="name" {...register("name")} />}
        </Field>
        <Field label="Email" error={errors.email?.message}>
          {(control) => <TextInput {...control} type="email" autoComplete="email" inputMode="email" {...register("email")} />}
        </Field>
        <Field label="Password" hint="At least 10 characters." error={errors.password?.message}>
          {(control) => <TextInput {...control} type="password" autoComplete="new-password" {...register("password")} />}
        </Field>
      </fieldset>
      <fieldset className="flex flex-col gap-4">
        <legend className="mb-3 text-sm font-semibold uppercase tracking-wide text-frost-600">Your site</legend>
        <SiteFields
          register={{ siteName: register("siteName"), timeZone: register("timeZone"), currency: register("currency") }}
          errors={{ siteName: errors.siteName?.message, timeZone: errors.timeZone?.message, currency: errors.currency?.message }}
          timeZone={timeZone}
          zones={zones}
        />
      </fieldset>
      <Button type="submit" pending={isSubmitting} pendingLabel="Creating your account…" className="w-full">
        Create account
      </Button>
    </form>
  );
}
