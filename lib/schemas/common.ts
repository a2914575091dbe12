import { z } from "zod";

export const recordId = (what: string) =>
  z.uuid({ error: `must be a ${what} id` });

/** A trimmed, non-empty line of text of at most `max` characters. */
export const line = (label: string, max: number) =>
  z
    .string({ error: `${label} must be text` })
    .trim()
    .min(1, `${label} is required`)
    .max(max, `${label} must be at most ${max} characters`);

export const isTimeZone = (value: string) => {
  try {
    new Intl.DateTimeFormat("en", { timeZone: value });
    // Intl also accepts offsets like "+01:00"; schedules need a named IANA zone.
    return /^[A-Za-z]+(?:\/[A-Za-z0-9_+-]+)+$|^UTC$/.test(value);
  } catch {
    return false;
  }
};

export const timeZone = z
  .string({ error: "Time zone must be text" })
  .trim()
  .max(64, "Time zone must be at most 64 characters")
  .refine(isTimeZone, "Time zone must be an IANA zone name such as Europe/London");

const currencies = new Set(Intl.supportedValuesOf("currency"));
export const currency = z
  .string({ error: "Currency must be text" })
  .trim()
  .toUpperCase()
  .refine((value) => currencies.has(value), "Currency must be an ISO 4217 code such as GBP or EUR");

export const decimalNumber = (label: string, min: number, max: number) =>
  z
    .number({ error: `${label} must be a number` })
    .min(min, `${label} must be at least ${min}`)
    .max(max, `${label} must be at most ${max}`);

const fahrenheit = (c: number) => Math.round(((c * 9) / 5 + 32) * 10) / 10;

/**
 * A temperature in °C (stored and sent in °C). The bounds are told in both units, as
 * the person may type in °F and the form converts before checking.
 */
export const temperatureC = (label: string, min: number, max: number) =>
  z
    .number({ error: `${label} must be a number` })
    .min(min, `${label} must be at least ${min} °C (${fahrenheit(min)} °F)`)
    .max(max, `${label} must be at most ${max} °C (${fahrenheit(max)} °F)`);

/** A whole number of seconds within bounds. */
export const seconds = (label: string, min: number, max: number) =>
  z
    .number({ error: `${label} must be a number` })
    .int(`${label} must be a whole number of seconds`)
    .min(min, `${label} must be at least ${min} s`)
    .max(max, `${label} must be at most ${max} s`);

/** A calendar date, YYYY-MM-DD (a local date of the site). */
export const localDate = (label: string) =>
  z
    .string({ error: `${label} must be text` })
    .regex(/^\d{4}-\d{2}-\d{2}$/, `${label} must be a date, YYYY-MM-DD`)
    .refine((v) => {
      const d = new Date(`${v}T00:00:00Z`);
      return !Number.isNaN(d.getTime()) && d.toISOString().startsWith(v);
    }, `${label} is not a date in the calendar`);

const TIME_OF_DAY_RE = /^([01]\d|2[0-3]):[0-5]\d$/;

/** A wall-clock time of day, HH:MM (00:00 to 23:59), read in the site's time zone. */
export const timeOfDay = (label: string) =>
  z.string({ error: `${label} must be text` }).regex(TIME_OF_DAY_RE, `${label} must be a time of day, HH:MM (00:00 to 23:59)`);
