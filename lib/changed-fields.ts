/**
 * The part of a change that differs from the stored row, with the stored values it
 * replaces: what is written and what the audit log records as before and after.
 */
export function changedFields<R extends object, C extends Partial<R>>(stored: R, change: C): { before: Partial<R>; after: Partial<C> } {
  const keys = (Object.keys(change) as (keyof C & keyof R)[]).filter((key) => change[key] !== undefined && !sameValue(change[key], stored[key]));
  return {
    before: Object.fromEntries(keys.map((key) => [key, stored[key]])) as unknown as Partial<R>,
    after: Object.fromEntries(keys.map((key) => [key, change[key]])) as unknown as Partial<C>,
  };
}

function sameValue(a: unknown, b: unknown): boolean {
  return a === b || (a == null && b == null);
}
