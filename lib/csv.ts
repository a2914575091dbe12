// What every CSV Cloche writes has in common.

/**
 * Text a person typed (a name, a reason) made safe for a spreadsheet: a cell that
 * starts with = + - @ or a control character would be run as a formula (OWASP, "CSV
 * Injection"), so it gets a leading apostrophe.
 */
export function csvText(value: string | null | undefined): string {
  if (value === null || value === undefined) return "";
  return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
}

/** A number with a fixed count of decimals, or empty. */
export function csvNumber(value: number | null | undefined, decimals: number): string {
  return value === null || value === undefined || !Number.isFinite(value) ? "" : value.toFixed(decimals);
}
