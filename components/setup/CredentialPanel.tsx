"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { formatInstant } from "@/components/houses/format";
import { Button } from "@/components/ui/Button";
import { Notice } from "@/components/ui/Notice";
import { sendJson } from "@/lib/client/api";
import { ConfirmButton } from "./ConfirmButton";

type CredentialPanelProps = {
  url: string;
  timeZone: string;
  /** The latest credential's times (ISO), never its secret. */
  status: { issuedAt: string; revokedAt: string | null } | null;
  canManage: boolean;
  retired: boolean;
};

type Issued = { username: string; secret: string };

/** The device's MQTT credential: whether one is active, a new secret shown once, and revoking. */
export function CredentialPanel({ url, timeZone, status, canManage, retired }: CredentialPanelProps) {
  const router = useRouter();
  const [issued, setIssued] = useState<Issued | null>(null);
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [copied, setCopied] = useState(false);
  const active = status && !status.revokedAt;

  async function issue() {
    setPending(true);
    setError(null);
    setCopied(false);
    const result = await sendJson<Issued>(url, "POST");
    setPending(false);
    if (!result.ok) return setError(result.error.message);
    setIssued(result.data);
    router.refresh();
  }

  async function copy(secret: string) {
    try {
      await navigator.clipboard.writeText(secret);
      setCopied(true);
    } catch {
      setError("This browser would not copy; select the secret and copy it by hand.");
    }
  }

  return (
    <div className="flex flex-col gap-3">
      <p className="text-sm text-frost-900" role="status">
        {!status
          ? "No credential issued yet: the device cannot sign in."
          : active
            ? `Active, issued ${formatInstant(new Date(status.issuedAt), timeZone)}.`
            : `Revoked ${formatInstant(new Date(status.revokedAt!), timeZone)}: the device cannot sign in.`}
      </p>
      {issued ? (
        <div className="flex flex-col gap-2 rounded-lg border border-leaf-300 bg-leaf-50 p-4">
          <p className="text-sm font-semibold text-leaf-900">Store this secret in the device now</p>
          <p className="text-sm text-leaf-800">It is shown only this once; Cloche keeps only a hash of it. Lost it? Issue a new one.</p>
          <code className="block break-all rounded-md border border-leaf-200 bg-white px-3 py-2 font-mono text-sm text-frost-950">{issued.secret}</code>
          <div className="flex flex-wrap items-center gap-3">
            <Button variant="secondary" onClick={() => copy(issued.secret)}>
              Copy the secret
            </Button>
            {copied ? <span className="text-sm text-leaf-800" role="status">Copied.</span> : null}
          </div>
        </div>
      ) : null}
      {error ? <Notice tone="error">{error}</Notice> : null}
      {canManage && !retired ? (
        <div className="flex flex-wrap gap-2">
          <Button onClick={issue} pending={pending} pendingLabel="Issuing…" variant={active ? "secondary" : "primary"}>
            {active ? "Issue a new secret" : "Issue a credential"}
          </Button>
          {active ? (
            <ConfirmButton
              label="Revoke"
              confirmLabel="Revoke the credential"
              url={url}
              method="DELETE"
              warning={<p>The device can no longer sign in to the broker until it is given a new secret.</p>}
              onDone={() => {
                setIssued(null);
                router.refresh();
              }}
            />
          ) : null}
        </div>
      ) : null}
      {active && canManage && !retired ? (
        <p className="text-xs text-frost-600">A new secret replaces the old one at once: the device must be given the new one.</p>
      ) : null}
    </div>
  );
}
