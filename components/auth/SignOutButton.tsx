"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/Button";
import { authClient } from "@/lib/client/auth-client";

export function SignOutButton({ className = "" }: { className?: string }) {
  const router = useRouter();
  const [pending, setPending] = useState(false);

  async function signOut() {
    setPending(true);
    try {
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
