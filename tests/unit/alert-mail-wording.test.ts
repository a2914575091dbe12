// What the alert e-mails say: subjects with what and where, figures in the reader's unit
// (°F = °C × 9/5 + 32), the site's local times, the link, and for frost what to check
// and the caution about heaters.
import { describe, expect, it } from "vitest";
import { clearedMail, raisedMail, reminderMail, type AlertForMail, type MailReader } from "@/lib/alerts/mail-wording";
import { renderMail } from "@/lib/alerts/mail-text";
import { summaryMail } from "@/lib/alerts/summary";

const frost: AlertForMail = {
  kind: "too_cold",
  message: "Long house is below its frost limit.",
  detail: { valueC: 1, limitC: 2, sensorName: "Bench sensor", since: "2026-12-03T02:04:00Z" },
  raisedAt: new Date("2026-12-03T02:10:00Z"),
  clearedAt: null,
  clearedMessage: null,
  houseName: "Long house",
};

const reader = (unit: "c" | "f"): MailReader => ({
  name: "Ada",
  unit,
  site: { name: "Fern Hollow", slug: "fern-hollow", zone: "America/New_York" },
  baseUrl: "http://127.0.0.1:3000/",
});

describe("alert e-mails", () => {
  it("say what and where in the subject, figures in the reader's unit and times in the site's zone", () => {
    const inF = raisedMail(frost, reader("f"));
    expect(inF.subject).toBe("Frost risk in Long house — Fern Hollow");
    expect(inF.text).toContain("The reading was 33.8 °F; this alert is for below 35.6 °F.");
    // 02:10 UTC is 21:10 EST the evening before.
    expect(inF.text).toContain("Opened at Wed 2 Dec 21:10 (America/New_York).");
    expect(inF.text).toContain("Since Wed 2 Dec 21:04.");
    expect(inF.text).toContain("http://127.0.0.1:3000/sites/fern-hollow/alerts");
    expect(inF.html).toContain('href="http://127.0.0.1:3000/sites/fern-hollow/alerts"');
    expect(raisedMail(frost, reader("c")).text).toContain("The reading was 1.0 °C; this alert is for below 2.0 °C.");
  });

  it("frost says what to check first and gives the caution about heaters", () => {
    const { text } = raisedMail(frost, reader("c"));
    expect(text).toMatch(/Is the heater on\?/);
    expect(text).toMatch(/Is the door shut/);
    expect(text).toMatch(/RCD-protected socket/);
    expect(text).toMatch(/within the plug's rating/);
    expect(text).toMatch(/clearances/);
    expect(text).toMatch(/local codes .*licensed electrician/);
    expect(text).toContain("Frost risk always goes out");
    const warm = raisedMail({ ...frost, kind: "too_warm", message: "Long house is too warm." }, reader("c"));
    expect(warm.subject).toBe("Too warm in Long house — Fern Hollow");
    expect(warm.text).not.toMatch(/RCD/);
    expect(warm.text).toContain("this alert is for above");
    // Condensation's limit is the dew point plus the margin: air at or below it, never "above".
    const damp = raisedMail({ ...frost, kind: "condensation", message: "Condensation risk in Long house.", detail: { valueC: 5.3, limitC: 5.7, dewPointC: 4.7, rh: 95 } }, reader("c"));
    expect(damp.text).toContain("this alert is for air at or below 5.7 °C, its dew point plus the margin.");
    expect(damp.text).not.toContain("this alert is for above");
  });

  it("a site-wide alert names the site only", () => {
    const stopped = raisedMail({ ...frost, kind: "controller_silent", houseName: null, detail: {}, message: "Cloche's controller is not running." }, reader("c"));
    expect(stopped.subject).toBe("Control stopped — Fern Hollow");
    expect(stopped.text).toMatch(/computer that runs Cloche/);
  });

  it("reminders and back-to-normal say so", () => {
    const reminder = reminderMail(frost, reader("c"), { number: 2, now: new Date("2026-12-03T06:10:00Z") });
    expect(reminder.subject).toBe("Still open: Frost risk in Long house — Fern Hollow");
    expect(reminder.text).toContain("4 h ago");
    expect(reminder.text).toContain("reminder 2");
    const cleared = clearedMail(
      { ...frost, clearedAt: new Date("2026-12-03T03:25:00Z"), clearedMessage: "Long house is back above its frost limit.", detail: { ...frost.detail, cleared: { valueC: 3, at: "2026-12-03T03:25:00Z" } } },
      reader("f"),
      { firstWasHeld: true },
    );
    expect(cleared.subject).toBe("Back to normal: Frost risk in Long house — Fern Hollow");
    expect(cleared.text).toContain("The reading then: 37.4 °F.");
    expect(cleared.text).toContain("back to normal at 22:25 (America/New_York), after 1 h 15 min");
    expect(cleared.text).toMatch(/quiet hours/);
  });

  it("escape what they quote in HTML", () => {
    const mail = renderMail("x", [{ p: 'A <b>house</b> & "shed"' }]);
    expect(mail.html).toContain("A &lt;b&gt;house&lt;/b&gt; &amp; &quot;shed&quot;");
    expect(mail.text).toBe('A <b>house</b> & "shed"\n');
  });

  it("the daily summary says which stretch it covers and gives each house's figures in the reader's unit", () => {
    const window = { day: "2026-12-02", from: new Date("2026-12-02T05:00:00Z"), to: new Date("2026-12-03T05:00:00Z"), wholeDay: true };
    const content = {
      window,
      site: { name: "Fern Hollow", slug: "fern-hollow", zone: "America/New_York", currency: "USD" },
      houses: [
        {
          name: "Long house",
          min: { c: -1, at: new Date("2026-12-02T11:05:00Z") },
          max: { c: 20, at: new Date("2026-12-02T19:30:00Z") },
          onHours: 6.25,
          kwh: 12.5,
          cost: 3.75,
          alerts: [{ kind: "too_cold" as const, message: "Below the frost limit.", raisedAt: new Date("2026-12-02T11:00:00Z"), clearedAt: new Date("2026-12-02T11:40:00Z") }],
        },
      ],
      siteAlerts: [],
      totals: { onHours: 6.25, kwh: 12.5, cost: 3.75, standingCharge: 0.5, total: 4.25 },
    };
    const mail = summaryMail(content, { name: "Ada", unit: "f", baseUrl: "http://127.0.0.1:3000" });
    expect(mail.subject).toBe("Daily summary for Fern Hollow — Wed 2 Dec");
    expect(mail.text).toContain("whole of Wed 2 Dec, midnight to midnight (America/New_York)");
    expect(mail.text).toContain("Coldest 30.2 °F at 06:05; warmest 68.0 °F at 14:30.");
    expect(mail.text).toContain("ran 6.3 h, using 12.5 kWh (US$3.75)");
    expect(mail.text).toContain("Frost risk: Below the frost limit. (from 06:00, back to normal at 06:40)");
    expect(mail.text).toContain("With the day's standing charge (US$0.50): US$4.25.");
    const partial = summaryMail({ ...content, window: { ...window, day: "2026-12-03", to: new Date("2026-12-03T23:00:00Z"), wholeDay: false } }, { name: "Ada", unit: "c", baseUrl: "http://x" });
    expect(partial.subject).toBe("Daily summary for Fern Hollow — Thu 3 Dec until 18:00");
    expect(partial.text).toContain("from midnight up to 18:00");
  });
});
