// An e-mail written once as blocks and rendered twice: plain text and simple HTML, so
// the two always say the same thing.
import { DateTime } from "luxon";

export type MailBlock =
  | { p: string }
  | { heading: string }
  | { list: string[] }
  | { link: string; href: string };

export type RenderedMail = { subject: string; text: string; html: string };

function escapeHtml(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}

export function renderMail(subject: string, blocks: MailBlock[]): RenderedMail {
  const text = blocks
    .map((b) => {
      if ("p" in b) return b.p;
      if ("heading" in b) return `${b.heading}\n${"-".repeat(Math.min(b.heading.length, 60))}`;
      if ("list" in b) return b.list.map((item) => `- ${item}`).join("\n");
      return `${b.link}: ${b.href}`;
    })
    .join("\n\n");
  const body = blocks
    .map((b) => {
      if ("p" in b) return `<p>${escapeHtml(b.p)}</p>`;
      if ("heading" in b) return `<h2 style="font-size:17px;margin:20px 0 6px">${escapeHtml(b.heading)}</h2>`;
      if ("list" in b) return `<ul>${b.list.map((item) => `<li>${escapeHtml(item)}</li>`).join("")}</ul>`;
      return `<p><a href="${escapeHtml(b.href)}" style="color:#1f5f3a;font-weight:600">${escapeHtml(b.link)}</a></p>`;
    })
    .join("\n");
  const html = `<!doctype html><html><body style="font-family:system-ui,sans-serif;font-size:16px;line-height:1.5;color:#1b1f1c;max-width:40em">\n${body}\n</body></html>`;
  return { subject, text: `${text}\n`, html };
}

/** "02:10" in the zone. */
export function localTime(at: Date, zone: string): string {
  return DateTime.fromJSDate(at, { zone }).toFormat("HH:mm");
}

/** "Thu 3 Dec 02:10" in the zone. */
export function localDateTime(at: Date, zone: string): string {
  return DateTime.fromJSDate(at, { zone }).toFormat("ccc d LLL HH:mm");
}

/** "Thu 3 Dec" for a local date (YYYY-MM-DD). */
export function localDay(day: string): string {
  return DateTime.fromISO(day, { zone: "UTC" }).toFormat("ccc d LLL");
}

/** "1 h 25 min", "40 min". */
export function duration(ms: number): string {
  const minutes = Math.max(0, Math.round(ms / 60_000));
  const h = Math.floor(minutes / 60);
  const m = minutes % 60;
  if (h === 0) return `${m} min`;
  return m === 0 ? `${h} h` : `${h} h ${m} min`;
}
