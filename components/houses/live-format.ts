import { ALERT_KIND_LABELS, SWITCH_CAUSE_LABELS, type AlertKind } from "@/lib/domain";
import type { PlugLiveJson } from "./live-data";

/** One decimal, with a true minus sign (frost readings are often below zero) and no "−0.0". */
export function formatTemp(tempC: number): string {
  const tenths = Math.round(tempC * 10);
  if (tenths === 0) return "0.0";
  return `${tenths < 0 ? "−" : ""}${(Math.abs(tenths) / 10).toFixed(1)}`;
}

export const formatRh = (rh: number) => `${Math.round(rh)} %`;

/** "just now", "12 s ago", "4 min ago", "3 h ago", "2 d ago": short enough for a phone line. */
export function formatAgo(at: Date, now: Date): string {
  const seconds = Math.max(0, Math.floor((now.getTime() - at.getTime()) / 1000));
  if (seconds < 5) return "just now";
  if (seconds < 60) return `${seconds} s ago`;
  const minutes = Math.floor(seconds / 60);
  if (minutes < 60) return `${minutes} min ago`;
  const hours = Math.floor(minutes / 60);
  if (hours < 24) return `${hours} h ago`;
  return `${Math.floor(hours / 24)} d ago`;
}

const dayKey = (at: Date, timeZone: string) =>
  new Intl.DateTimeFormat("en-CA", { year: "numeric", month: "2-digit", day: "2-digit", timeZone }).format(at);

/** "14:05" when it is the same site-local day as `now`, else "3 Mar, 14:05". */
export function formatSiteTime(at: Date, now: Date, timeZone: string): string {
  const time = new Intl.DateTimeFormat("en-GB", { hour: "2-digit", minute: "2-digit", hourCycle: "h23", timeZone }).format(at);
  if (dayKey(at, timeZone) === dayKey(now, timeZone)) return time;
  const day = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", timeZone }).format(at);
  return `${day}, ${time}`;
}

/**
 * Why the plug is as it is now: once its last switch is confirmed, what the controller
 * now keeps it so for (a plug that fell back to its fail-safe off may since be kept off
 * by its schedule); before that, the switch on its way.
 */
export function presentCause(plug: Pick<PlugLiveJson, "cause" | "presentCause" | "acknowledged">): PlugLiveJson["cause"] {
  return plug.acknowledged === false || !plug.presentCause ? plug.cause : plug.presentCause;
}

export function causeWords(plug: Pick<PlugLiveJson, "cause">): string {
  return plug.cause === null ? "Not switched by Cloche yet" : SWITCH_CAUSE_LABELS[plug.cause];
}

export const alertWords = (kind: string) =>
  ALERT_KIND_LABELS[kind as AlertKind] ?? kind.replace(/_/g, " ").replace(/^./, (c) => c.toUpperCase());
