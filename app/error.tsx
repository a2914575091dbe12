"use client";

import { PageLoadError } from "@/components/ui/PageLoadError";

// Errors of the site's own layout (its session and membership checks) and of pages
// outside a site land here.
export default function AppError(props: { error: unknown; retry: () => void }) {
  return (
    <main className="mx-auto flex min-h-dvh max-w-md flex-col justify-center px-4">
      <PageLoadError {...props} />
    </main>
  );
}
