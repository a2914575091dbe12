"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/Button";
import { Field } from "@/components/ui/Field";
import { Notice } from "@/components/ui/Notice";
import { TextInput } from "@/components/ui/TextInput";
import { INVITATION_TTL_HOURS } from "@/lib/domain";
import { invitationSchema, type InvitationInput } from "@/lib/schemas/members";
import { ApiError, requestJson } from "./api";
import { RoleChoice } from "./RoleChoice";

export function InviteForm({ siteId, onInvited }: { siteId: string; onInvited: () => void }) {
  const [serverError, setServerError] = useState<string | null>(null);
  const [sentTo, setSentTo] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    reset,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<InvitationInput>({ resolver: zodResolver(invitationSchema), defaultValues: { email: "", role: "helper" } });

  const onSubmit = handleSubmit(async (values) => {
    setServerError(null);
    setSentTo(null);
    try {
      await requestJson(`/api/sites/${siteId}/invitations`, { method: "POST", body: values });
      setSentTo(values.email);
      reset({ email: "", role: values.role });
      onInvited();
    } catch (error) {
      const e = error as ApiError;
      if (e.fields?.email) setError("email", { message: e.message }, { shouldFocus: true });
      else setServerError(e.message);
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {serverError ? <Notice tone="error">{serverError}</Notice> : null}
      {sentTo ? <Notice>Invitation sent to {sentTo}. The link works once, for {INVITATION_TTL_HOURS} hours.</Notice> : null}
      <Field label="E-mail address" error={errors.email?.message}>
        {(control) => <TextInput {...control} type="email" autoComplete="off" inputMode="email" {...register("email")} />}
      </Field>
      <RoleChoice register={register("role")} error={errors.role?.message} />
      <Button type="submit" pending={isSubmitting} pendingLabel="Sending…" className="w-full sm:w-auto sm:self-start">
        Send invitation
      </Button>
    </form>
  );
}
