"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/Button";

export function SignOutButton({ className = "" }: { className?: string }) {
  const router = useRouter();
  const [pending, setPending] = useState(false);

  async function signOut() {
    setPending(true);
    try {
      // Loaded on the press: the header is on every page, and the auth client would
      // otherwise weigh on every page's first load (about 12 kB compressed).
      const { authClient } = await import("@/lib/client/auth-client");
      await authClient.signOut();
    } finally {
      // Even if the request failed, the sign-in page is the right place to land:
      // it checks the session for real and sends a still-signed-in person back.
      router.push("/sign-in");
      router.refresh();
    }
  }

  return (
    <Button variant="quiet" onClick={signOut} pending={pending} pendingLabel="Signing out…" className={className}>
      Sign out
    </Button>
  );
}
