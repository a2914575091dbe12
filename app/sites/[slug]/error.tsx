"use client";

import { useEffect } from "react";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";

export default function SiteError({ error, retry }: { error: unknown; retry: () => void }) {
  useEffect(() => {
    console.error(error);
  }, [error]);

  const digest = error instanceof Error && "digest" in error ? String(error.digest) : null;

  return (
    <Card as="section" className="mx-auto max-w-lg px-5 py-8 text-center" aria-labelledby="site-error-title">
      <h1 id="site-error-title" className="text-lg font-semibold text-frost-950">
        This page didn’t load
      </h1>
      <p className="mt-2 text-sm text-frost-700">
        Something went wrong while loading it. Try again in a moment.
      </p>
      {digest ? <p className="mt-2 text-xs text-frost-500">Reference: {digest}</p> : null}
      <Button onClick={() => retry()} className="mt-5">
        Try again
      </Button>
    </Card>
  );
}
