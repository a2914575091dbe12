"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { authErrorMessage, fieldOfMessage } from "@/components/auth/auth-error-message";
import { Button } from "@/components/ui/Button";
import { Field } from "@/components/ui/Field";
import { Notice } from "@/components/ui/Notice";
import { TextInput } from "@/components/ui/TextInput";
import { requestJson, type ApiError } from "@/components/members/api";
import { authClient } from "@/lib/client/auth-client";
import { inviteeSignUpSchema, type InviteeSignUpInput } from "@/lib/schemas/members";

type Joined = { site: { slug: string } };

function useAccept(token: string) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const accept = async () => {
    setError(null);
    try {
      const { site } = await requestJson<Joined>(`/api/invitations/${token}/accept`, { method: "POST" });
      router.push(`/sites/${site.slug}`);
      router.refresh();
      return true;
    } catch (e) {
      setError((e as ApiError).message);
      return false;
    }
  };
  return { accept, error };
}

/** For the signed-in person the invitation is for: one press. */
export function AcceptButton({ token, siteName }: { token: string; siteName: string }) {
  const { accept, error } = useAccept(token);
  const [pending, setPending] = useState(false);
  return (
    <div className="flex flex-col gap-3">
      {error ? <Notice tone="error">{error}</Notice> : null}
      <Button
        className="w-full"
        pending={pending}
        pendingLabel="Joining…"
        onClick={async () => {
          setPending(true);
          if (!(await accept())) setPending(false);
        }}
      >
        Join {siteName}
      </Button>
    </div>
  );
}

/**
 * For someone without an account: name and password, the e-mail fixed to the invited
 * one. Sign-up is better-auth's own; the invitation's token tells it to make no site.
 */
export function InviteeSignUp({ token, email, siteName }: { token: string; email: string; siteName: string }) {
  const { accept, error: acceptError } = useAccept(token);
  const [serverError, setServerError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<InviteeSignUpInput>({ resolver: zodResolver(inviteeSignUpSchema), defaultValues: { name: "", password: "" } });

  const onSubmit = handleSubmit(async (values) => {
    setServerError(null);
    const body = { ...values, email, invitationToken: token } as Parameters<typeof authClient.signUp.email>[0];
    try {
      const { error } = await authClient.signUp.email(body);
      if (error) {
        const named = error.status === 400 ? fieldOfMessage(error.message) : null;
        if (named && (named.field === "name" || named.field === "password")) setError(named.field, { message: named.message }, { shouldFocus: true });
        else setServerError(authErrorMessage(error, "Could not create your account."));
        return;
      }
    } catch {
      setServerError(authErrorMessage({}, "Could not create your account."));
      return;
    }
    await accept();
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {serverError ? <Notice tone="error">{serverError}</Notice> : null}
      {acceptError ? <Notice tone="error">{acceptError}</Notice> : null}
      <Field label="Email" hint="The address the invitation was sent to.">
        {(control) => <TextInput {...control} type="email" value={email} readOnly aria-readonly="true" className="bg-frost-100" />}
      </Field>
      <Field label="Your name" error={errors.name?.message}>
        {(control) => <TextInput {...control} autoComplete="name" {...register("name")} />}
      </Field>
      <Field label="Password" hint="At least 10 characters." error={errors.password?.message}>
        {(control) => <TextInput {...control} type="password" autoComplete="new-password" {...register("password")} />}
      </Field>
      <Button type="submit" pending={isSubmitting} pendingLabel="Creating your account…" className="w-full">
        Create account and join {siteName}
      </Button>
    </form>
  );
}
