import { DATABASE_UNAVAILABLE_MESSAGE } from "@/lib/errors";

/** What better-auth's client hands back when a request fails. */
export type AuthClientError = { status?: number; message?: string; code?: string } | null | undefined;

export const TOO_MANY_ATTEMPTS = "Too many attempts; wait a minute and try again";

export function authErrorMessage(error: AuthClientError, fallback: string): string {
  if (!error) return fallback;
  if (error.status === 429) return TOO_MANY_ATTEMPTS;
  if (!error.status) return "Could not reach Cloche. Check your connection and try again.";
  if (error.status === 503) return DATABASE_UNAVAILABLE_MESSAGE;
  if (error.status >= 500) return "Something went wrong on our side. Please try again.";
  return error.message || fallback;
}

/** Messages of the form "field: what is wrong" name the field at fault. */
export function fieldOfMessage(message: string | undefined): { field: string; message: string } | null {
  const match = message?.match(/^([A-Za-z][\w.]*): (.+)$/);
  return match ? { field: match[1]!, message: match[2]! } : null;
}
