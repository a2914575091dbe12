import { describe, expect, it } from "vitest";
import { bandWords, describeInForce, whenWords, type RuleView } from "@/lib/control/plan-words";

const zone = "Europe/London";
// Wednesday 15 January 2025, 14:00 in London (GMT, so UTC as well).
const now = new Date("2025-01-15T14:00:00Z");
const band = (lowC: number, highC: number, scheduleName: string | null = "Winter nights"): RuleView => ({
  kind: "window",
  mode: "band",
  lowC,
  highC,
  scheduleName,
});
const frost: RuleView = { kind: "frost", lowC: 3, highC: 5 };

describe("whenWords", () => {
  it("names the day the way a grower reads it, in the site's zone", () => {
    expect(whenWords(new Date("2025-01-15T18:00:00Z"), now, zone)).toBe("18:00");
    expect(whenWords(new Date("2025-01-16T06:00:00Z"), now, zone)).toBe("tomorrow 06:00");
    expect(whenWords(new Date("2025-01-17T06:00:00Z"), now, zone)).toBe("Fri 06:00");
    expect(whenWords(new Date("2025-01-24T06:00:00Z"), now, zone)).toBe("24 Jan 06:00");
  });

  it("uses the site's local day, not UTC's", () => {
    // 23:30 UTC on the 15th is already the 16th at 10:30 in Sydney (AEDT, UTC+11).
    const sydneyNow = new Date("2025-01-15T12:00:00Z"); // 23:00 on the 15th in Sydney
    expect(whenWords(new Date("2025-01-15T23:30:00Z"), sydneyNow, "Australia/Sydney")).toBe("tomorrow 10:30");
    expect(whenWords(new Date("2025-01-15T12:30:00Z"), sydneyNow, "Australia/Sydney")).toBe("23:30");
  });
});

describe("bandWords", () => {
  it("shows the edges in the person's unit", () => {
    expect(bandWords(8, 10, "c")).toBe("8–10 °C");
    // 8 °C = 46.4 °F, 10 °C = 50 °F (F = C × 9/5 + 32).
    expect(bandWords(8, 10, "f")).toBe("46.4–50 °F");
    expect(bandWords(-2.5, 1, "c")).toBe("−2.5–1 °C");
    expect(bandWords(null, 10, "c")).toBe("up to 10 °C");
    expect(bandWords(8, null, "c")).toBe("from 8 °C");
    expect(bandWords(null, null, "c")).toBe("edges not set");
  });
});

describe("describeInForce", () => {
  const words = (view: Parameters<typeof describeInForce>[0], unit: "c" | "f" = "c") => describeInForce(view, { unit, timeZone: zone, now });

  it("a band window until its end, and what follows", () => {
    const result = words({ rule: band(8, 10), until: new Date("2025-01-15T18:00:00Z"), next: frost, guardUntil: null });
    expect(result.line).toBe("Band 8–10 °C (Winter nights) until 18:00, then frost protection 3–5 °C");
    expect(result.detail).toBeNull();
    expect(result.guard).toBeNull();
  });

  it("frost protection, then a band, in °F", () => {
    const result = words({ rule: frost, until: new Date("2025-01-16T06:00:00Z"), next: band(16, 18, "Days"), guardUntil: null }, "f");
    // 3 °C = 37.4 °F, 5 °C = 41 °F, 16 °C = 60.8 °F, 18 °C = 64.4 °F.
    expect(result.line).toBe("Frost protection 37.4–41 °F until tomorrow 06:00, then band 60.8–64.4 °F (Days)");
  });

  it("an override with who and why", () => {
    const rule: RuleView = { kind: "override", on: true, by: "Tam", reason: "Drying the benches" };
    const result = words({ rule, until: new Date("2025-01-15T15:30:00Z"), next: band(8, 10), guardUntil: null });
    expect(result.line).toBe("Override: on until 15:30, then band 8–10 °C (Winter nights)");
    expect(result.detail).toBe("By Tam: Drying the benches");
  });

  it("an override with no end, by someone since removed", () => {
    const rule: RuleView = { kind: "override", on: false, by: null, reason: "Glass being replaced" };
    const result = words({ rule, until: null, next: null, guardUntil: null });
    expect(result.line).toBe("Override: off, with no end set");
    expect(result.detail).toBe("Glass being replaced");
  });

  it("off outside windows with nothing coming", () => {
    expect(words({ rule: { kind: "off" }, until: null, next: null, guardUntil: null }).line).toBe("Off outside windows");
  });

  it("a plain on window", () => {
    const rule: RuleView = { kind: "window", mode: "on", scheduleName: "Lights" };
    const result = words({ rule, until: new Date("2025-01-17T22:00:00Z"), next: { kind: "off" }, guardUntil: null });
    expect(result.line).toBe("On by the schedule (Lights) until Fri 22:00, then off outside windows");
  });

  it("the guard's wait shows while it holds, not after", () => {
    const view = { rule: band(8, 10), until: null, next: null };
    expect(words({ ...view, guardUntil: new Date("2025-01-15T14:02:30Z") }).guard).toBe("Waiting out the minimum on/off time until 14:02");
    expect(words({ ...view, guardUntil: new Date("2025-01-15T13:59:00Z") }).guard).toBeNull();
    expect(words({ ...view, guardUntil: "2025-01-15T14:05:00.000Z" }).guard).toBe("Waiting out the minimum on/off time until 14:05");
  });
});
