"use client";

import { createContext, useContext, useSyncExternalStore } from "react";
import useSWR from "swr";
import type { SiteLiveJson } from "./live-data";

export type LiveSiteValue = { siteId: string; timeZone: string; initial: SiteLiveJson };

export const LiveSiteContext = createContext<LiveSiteValue | null>(null);

/** Live data plus how far this browser's clock is behind the server's. */
export type LiveData = SiteLiveJson & { clockOffsetMs?: number };

export class LiveError extends Error {
  readonly status: number | null;
  constructor(message: string, status: number | null) {
    super(message);
    this.name = "LiveError";
    this.status = status;
  }
}

function serverMessage(body: unknown): string | null {
  if (typeof body !== "object" || body === null || !("error" in body)) return null;
  const error = (body as { error: unknown }).error;
  if (typeof error !== "object" || error === null || !("message" in error)) return null;
  const message = (error as { message: unknown }).message;
  return typeof message === "string" && message ? message : null;
}

async function fetchLive(url: string): Promise<LiveData> {
  let response: Response;
  try {
    response = await fetch(url, { headers: { accept: "application/json" }, cache: "no-store" });
  } catch {
    throw new LiveError("Cloche can’t be reached from this device right now.", null);
  }
  const body: unknown = await response.json().catch(() => null);
  if (!response.ok) {
    throw new LiveError(serverMessage(body) ?? `The server answered with status ${response.status}.`, response.status);
  }
  const data = body as SiteLiveJson;
  return { ...data, clockOffsetMs: Date.parse(data.at) - Date.now() };
}

export const liveUrl = (siteId: string) => `/api/sites/${encodeURIComponent(siteId)}/live`;

/**
 * What is happening in the site now, refreshed every 5 s while the page is visible.
 * Starts from the data the server rendered with; null outside a `LiveSite`.
 */
export function useSiteLive() {
  const site = useContext(LiveSiteContext);
  const { data, error } = useSWR<LiveData, LiveError>(site ? liveUrl(site.siteId) : null, fetchLive, {
    fallbackData: site?.initial,
    refreshInterval: 5000,
    revalidateOnFocus: true,
    // Signed out, or no longer a member: asking again will not help; the poll still will once it is fixed.
    shouldRetryOnError: (err) => err.status === null || err.status >= 500,
  });
  if (!site || !data) return null;
  return { data, error: error ?? null, timeZone: site.timeZone };
}

const listeners = new Set<() => void>();
let timer: ReturnType<typeof setInterval> | undefined;

function subscribeToSeconds(listener: () => void) {
  listeners.add(listener);
  timer ??= setInterval(() => listeners.forEach((l) => l()), 1000);
  return () => {
    listeners.delete(listener);
    if (listeners.size === 0 && timer !== undefined) {
      clearInterval(timer);
      timer = undefined;
    }
  };
}

const currentSecond = () => Math.floor(Date.now() / 1000) * 1000;

/**
 * The time now, ticking each second, on the server's clock as far as it is known.
 * Server render and hydration use the moment the server read the data, so the first
 * markup matches.
 */
export function useNow(): Date {
  const site = useContext(LiveSiteContext);
  const live = useSiteLive();
  const serverAt = site ? Date.parse(site.initial.at) : 0;
  const ms = useSyncExternalStore(subscribeToSeconds, currentSecond, () => serverAt);
  return new Date(ms + (live?.data.clockOffsetMs ?? 0));
}
