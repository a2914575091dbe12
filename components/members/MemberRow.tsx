"use client";

import { useState } from "react";
import { Button } from "@/components/ui/Button";
import { Select } from "@/components/ui/Select";
import { ROLES, ROLE_LABELS, type Role } from "@/lib/permissions";
import { formatDay, requestJson, type ApiError } from "./api";
import { ConfirmButton } from "./Confirm";

export type MemberJson = { userId: string; name: string; email: string; role: Role; since: string };

type Props = {
  siteId: string;
  member: MemberJson;
  timeZone: string;
  canManage: boolean;
  isYou: boolean;
  onChanged: () => void;
  onError: (message: string | null) => void;
};

export function MemberRow({ siteId, member, timeZone, canManage, isYou, onChanged, onError }: Props) {
  const [role, setRole] = useState<Role>(member.role);
  const [saving, setSaving] = useState(false);
  const url = `/api/sites/${siteId}/members/${member.userId}`;
  const selectId = `role-${member.userId}`;

  async function act(work: () => Promise<unknown>) {
    onError(null);
    try {
      await work();
      onChanged();
    } catch (error) {
      onError((error as ApiError).message);
      setRole(member.role);
    }
  }

  return (
    <li className="flex flex-col gap-3 py-4 sm:flex-row sm:items-start sm:justify-between">
      <div className="min-w-0">
        <p className="font-semibold text-frost-950">
          {member.name}
          {isYou ? <span className="ml-2 text-sm font-normal text-frost-600">(you)</span> : null}
        </p>
        <p className="truncate text-sm text-frost-700">{member.email}</p>
        <p className="mt-1 text-sm text-frost-700">
          <span className="font-medium text-frost-900">{ROLE_LABELS[member.role].name}</span> · member since {formatDay(member.since, timeZone)}
        </p>
      </div>
      {canManage ? (
        <div className="flex flex-col gap-2 sm:w-64">
          <label htmlFor={selectId} className="text-sm font-medium text-frost-900">
            Role of {member.name}
          </label>
          <Select id={selectId} value={role} onChange={(e) => setRole(e.target.value as Role)}>
            {ROLES.map((r) => (
              <option key={r} value={r}>
                {ROLE_LABELS[r].name} — {ROLE_LABELS[r].summary}
              </option>
            ))}
          </Select>
          {role !== member.role ? (
            <Button
              pending={saving}
              pendingLabel="Saving…"
              onClick={async () => {
                setSaving(true);
                await act(() => requestJson(url, { method: "PATCH", body: { role } }));
                setSaving(false);
              }}
            >
              Make {ROLE_LABELS[role].name.toLowerCase()}
            </Button>
          ) : null}
          <ConfirmButton
            label={isYou ? "Leave this site" : "Remove from site"}
            question={isYou ? "Leave this site? You will lose access at once." : `Remove ${member.name} from this site? They lose access at once.`}
            confirmLabel={isYou ? "Yes, leave" : "Yes, remove"}
            pendingLabel="Removing…"
            onConfirm={() => act(() => requestJson(url, { method: "DELETE" }))}
          />
        </div>
      ) : null}
    </li>
  );
}
