import type { ReactNode } from "react";
import { Button } from "@/components/ui/Button";
import { Notice } from "@/components/ui/Notice";

type FormShellProps = {
  onSubmit: () => void;
  error: string | null;
  pending: boolean;
  submitLabel: string;
  pendingLabel: string;
  children: ReactNode;
};

/** A form's frame: the error that found no field above it, the fields, one large submit button. */
export function FormShell({ onSubmit, error, pending, submitLabel, pendingLabel, children }: FormShellProps) {
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {error ? <Notice tone="error">{error}</Notice> : null}
      {children}
      <Button type="submit" pending={pending} pendingLabel={pendingLabel} className="mt-2 w-full sm:w-auto sm:self-start">
        {submitLabel}
      </Button>
    </form>
  );
}
