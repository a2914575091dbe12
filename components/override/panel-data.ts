import type { OverridePanel, OverrideView } from "@/db/queries/overrides";

/** A value as it arrives in JSON: its dates as ISO strings. */
export type Jsonified<T> = T extends Date
  ? string
  : T extends (infer U)[]
    ? Jsonified<U>[]
    : T extends object
      ? { [K in keyof T]: Jsonified<T[K]> }
      : T;

export type OverridePanelJson = Jsonified<OverridePanel>;
export type OverrideViewJson = Jsonified<OverrideView>;

export const panelUrl = (siteId: string, plugId: string) =>
  `/api/sites/${encodeURIComponent(siteId)}/plugs/${encodeURIComponent(plugId)}/overrides`;

export const eventsUrl = (siteId: string, plugId: string) =>
  `/api/sites/${encodeURIComponent(siteId)}/plugs/${encodeURIComponent(plugId)}/events`;

/** The message of the one error shape, or a plain one. */
export async function errorMessage(response: Response): Promise<string> {
  const body = (await response.json().catch(() => null)) as { error?: { message?: string } } | null;
  return body?.error?.message ?? `The server answered with status ${response.status}.`;
}
