"use client";

import { useEffect, useState } from "react";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { DATABASE_UNAVAILABLE_MESSAGE } from "@/lib/errors";

type Cause = "checking" | "database" | "other";

/**
 * A page that did not load. The error itself reaches the browser without its detail,
 * so the health check is asked whether the database is the reason: then the page can
 * say so instead of "something went wrong".
 */
export function PageLoadError({ error, retry }: { error: unknown; retry: () => void }) {
  const [cause, setCause] = useState<Cause>("checking");

  useEffect(() => {
    console.error(error);
    const controller = new AbortController();
    fetch("/api/health", { cache: "no-store", signal: controller.signal })
      .then((response) => response.json() as Promise<{ database?: { state?: string } }>)
      .then((health) => setCause(health.database?.state === "down" ? "database" : "other"))
      .catch(() => setCause(controller.signal.aborted ? "checking" : "other"));
    return () => controller.abort();
  }, [error]);

  const digest = error instanceof Error && "digest" in error ? String(error.digest) : null;

  return (
    <Card as="section" className="mx-auto max-w-lg px-5 py-8 text-center" aria-labelledby="page-error-title" aria-live="polite">
      <h1 id="page-error-title" className="text-lg font-semibold text-frost-950">
        {cause === "database" ? "Cloche can’t reach its database" : "This page didn’t load"}
      </h1>
      <p className="mt-2 text-sm text-frost-700">
        {cause === "database" ? DATABASE_UNAVAILABLE_MESSAGE : "Something went wrong while loading it. Try again in a moment."}
      </p>
      {digest && cause !== "database" ? <p className="mt-2 text-xs text-frost-500">Reference: {digest}</p> : null}
      <Button onClick={() => retry()} className="mt-5">
        Try again
      </Button>
    </Card>
  );
}
