"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/Button";
import { Field } from "@/components/ui/Field";
import { Notice } from "@/components/ui/Notice";
import { TextInput } from "@/components/ui/TextInput";
import { authClient } from "@/lib/client/auth-client";
import { signInSchema } from "@/lib/schemas/account";
import { authErrorMessage } from "./auth-error-message";

export function SignInForm({ next = "/" }: { next?: string }) {
  const router = useRouter();
  const [serverError, setServerError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    formState: { errors, isSubmitting },
  } = useForm({ resolver: zodResolver(signInSchema), defaultValues: { email: "", password: "" } });

  const onSubmit = handleSubmit(async (values) => {
    setServerError(null);
    try {
      const { error } = await authClient.signIn.email(values);
      if (error) {
        setServerError(authErrorMessage(error, "Could not sign you in."));
        return;
      }
    } catch {
      setServerError(authErrorMessage({}, "Could not sign you in."));
      return;
    }
    router.push(next);
    router.refresh();
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {serverError ? <Notice tone="error">{serverError}</Notice> : null}
      <Field label="Email" error={errors.email?.message}>
        {(control) => <TextInput {...control} type="email" autoComplete="email" inputMode="email" {...register("email")} />}
      </Field>
      <Field label="Password" error={errors.password?.message}>
        {(control) => <TextInput {...control} type="password" autoComplete="current-password" {...register("password")} />}
      </Field>
      <Button type="submit" pending={isSubmitting} pendingLabel="Signing in…" className="mt-2 w-full">
        Sign in
      </Button>
    </form>
  );
}
