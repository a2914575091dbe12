"use client";

import { ROLE_LABELS, type Role } from "@/lib/permissions";
import { formatMoment, requestJson, type ApiError } from "./api";
import { ConfirmButton } from "./Confirm";
import { Button } from "@/components/ui/Button";
import { useState } from "react";

export type InvitationJson = { id: string; email: string; role: Role; state: "pending" | "expired"; expiresAt: string; inviterName: string | null };

type Props = {
  siteId: string;
  invitations: InvitationJson[];
  timeZone: string;
  onChanged: () => void;
  onError: (message: string | null) => void;
  onNotice: (message: string | null) => void;
};

export function PendingInvitations({ siteId, invitations, timeZone, onChanged, onError, onNotice }: Props) {
  const [resending, setResending] = useState<string | null>(null);
  if (invitations.length === 0) return <p className="text-sm text-frost-700">No open invitations.</p>;

  async function act(work: () => Promise<unknown>, done: string) {
    onError(null);
    onNotice(null);
    try {
      await work();
      onNotice(done);
      onChanged();
    } catch (error) {
      onError((error as ApiError).message);
    }
  }

  return (
    <ul className="divide-y divide-frost-200">
      {invitations.map((invitation) => {
        const url = `/api/sites/${siteId}/invitations/${invitation.id}`;
        return (
          <li key={invitation.id} className="flex flex-col gap-3 py-4 sm:flex-row sm:items-start sm:justify-between">
            <div className="min-w-0">
              <p className="truncate font-semibold text-frost-950">{invitation.email}</p>
              <p className="text-sm text-frost-700">
                {ROLE_LABELS[invitation.role].name}
                {invitation.inviterName ? ` · invited by ${invitation.inviterName}` : ""}
              </p>
              <p className={`mt-1 text-sm ${invitation.state === "expired" ? "font-medium text-ember-700" : "text-frost-700"}`}>
                {invitation.state === "expired" ? "Expired" : "Link works until"} {formatMoment(invitation.expiresAt, timeZone)}
              </p>
            </div>
            <div className="flex flex-col gap-2 sm:w-64">
              <Button
                variant="secondary"
                pending={resending === invitation.id}
                pendingLabel="Sending…"
                onClick={async () => {
                  setResending(invitation.id);
                  await act(() => requestJson(`${url}/resend`, { method: "POST" }), `Sent again to ${invitation.email}; the earlier link no longer works.`);
                  setResending(null);
                }}
              >
                Send again
              </Button>
              <ConfirmButton
                label="Withdraw"
                question={`Withdraw the invitation to ${invitation.email}? Its link stops working.`}
                confirmLabel="Yes, withdraw"
                pendingLabel="Withdrawing…"
                onConfirm={() => act(() => requestJson(url, { method: "DELETE" }), `Invitation to ${invitation.email} withdrawn.`)}
              />
            </div>
          </li>
        );
      })}
    </ul>
  );
}
