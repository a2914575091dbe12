"use client";

import { PageLoadError } from "@/components/ui/PageLoadError";

export default function SiteError(props: { error: unknown; retry: () => void }) {
  return <PageLoadError {...props} />;
}
