"use client";

import { useState } from "react";
import useSWR from "swr";
import { Card } from "@/components/ui/Card";
import { Notice } from "@/components/ui/Notice";
import { getJson } from "./api";
import { InviteForm } from "./InviteForm";
import { MemberRow, type MemberJson } from "./MemberRow";
import { PendingInvitations, type InvitationJson } from "./PendingInvitations";

type Props = {
  siteId: string;
  timeZone: string;
  youId: string;
  canManage: boolean;
  initialMembers: MemberJson[];
};

/** The members of a site; an owner also invites, changes roles and removes. */
export function MembersPanel({ siteId, timeZone, youId, canManage, initialMembers }: Props) {
  const [error, setError] = useState<string | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const members = useSWR<{ members: MemberJson[] }>(`/api/sites/${siteId}/members`, getJson, { fallbackData: { members: initialMembers } });
  const invitations = useSWR<{ invitations: InvitationJson[] }>(canManage ? `/api/sites/${siteId}/invitations` : null, getJson);
  const refresh = () => {
    void members.mutate();
    void invitations.mutate();
  };
  const list = members.data?.members ?? [];

  return (
    <div className="flex flex-col gap-6">
      <div aria-live="polite" className="flex flex-col gap-2">
        {error ? <Notice tone="error">{error}</Notice> : null}
        {notice ? <Notice>{notice}</Notice> : null}
        {members.error ? <Notice tone="error">{(members.error as Error).message}</Notice> : null}
      </div>

      <Card as="section" className="p-4 sm:p-6" aria-labelledby="members-title">
        <h2 id="members-title" className="text-lg font-semibold text-frost-950">
          {list.length} {list.length === 1 ? "member" : "members"}
        </h2>
        {!canManage ? <p className="mt-1 text-sm text-frost-600">Only an owner can invite people or change roles.</p> : null}
        <ul className="divide-y divide-frost-200">
          {list.map((member) => (
            <MemberRow
              key={`${member.userId}-${member.role}`}
              siteId={siteId}
              member={member}
              timeZone={timeZone}
              canManage={canManage}
              isYou={member.userId === youId}
              onChanged={refresh}
              onError={setError}
            />
          ))}
        </ul>
      </Card>

      {canManage ? (
        <>
          <Card as="section" className="p-4 sm:p-6" aria-labelledby="invite-title">
            <h2 id="invite-title" className="mb-4 text-lg font-semibold text-frost-950">
              Invite someone
            </h2>
            <InviteForm siteId={siteId} onInvited={refresh} />
          </Card>
          <Card as="section" className="p-4 sm:p-6" aria-labelledby="invitations-title">
            <h2 id="invitations-title" className="text-lg font-semibold text-frost-950">
              Open invitations
            </h2>
            {invitations.data ? (
              <PendingInvitations
                siteId={siteId}
                invitations={invitations.data.invitations}
                timeZone={timeZone}
                onChanged={refresh}
                onError={setError}
                onNotice={setNotice}
              />
            ) : invitations.error ? (
              <Notice tone="error">{(invitations.error as Error).message}</Notice>
            ) : (
              <p className="text-sm text-frost-600">Loading…</p>
            )}
          </Card>
        </>
      ) : null}
    </div>
  );
}
