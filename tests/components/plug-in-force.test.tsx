import { cleanup, render, screen, waitFor } from "@testing-library/react";
import { http, HttpResponse } from "msw";
import { setupServer } from "msw/node";
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { SWRConfig } from "swr";
import type { SiteLiveJson } from "@/components/houses/live-data";
import { LiveSite } from "@/components/houses/LiveSite";
import { PlugInForce } from "@/components/houses/PlugInForce";
import { TemperatureUnitProvider } from "@/components/site/TemperatureUnit";
import type { TemperatureUnit } from "@/lib/domain";

const siteId = "5d1f0b8e-4c7a-4f0e-9d1c-2b3a4c5d6e7f";
const plugId = "9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d";
const at = "2030-01-16T12:00:00.000Z"; // a Wednesday; noon in London

function live(inForce: SiteLiveJson["plugs"][number]["inForce"]): SiteLiveJson {
  return {
    at,
    sensors: [],
    plugs: [
      {
        plugId,
        houseId: "h",
        online: true,
        lastSeenAt: at,
        on: true,
        cause: "schedule",
        since: at,
        acknowledged: true,
        presentCause: "schedule",
        inForce,
      },
    ],
    openAlerts: [],
    controller: { running: true, lastBeatAt: at },
  };
}

const band = live({
  rule: { kind: "window", mode: "band", lowC: 8, highC: 10, scheduleName: "Winter days" },
  until: "2030-01-16T18:00:00.000Z",
  next: { kind: "frost", lowC: 3, highC: 5 },
  guardUntil: "2030-01-16T12:02:00.000Z",
});

const server = setupServer();
beforeAll(() => server.listen({ onUnhandledRequest: "error" }));
afterEach(() => {
  cleanup();
  server.resetHandlers();
});
afterAll(() => server.close());

beforeAll(() => {
  vi.useFakeTimers({ toFake: ["Date"] });
  vi.setSystemTime(new Date(at));
});
afterAll(() => vi.useRealTimers());

function show(initial: SiteLiveJson, unit: TemperatureUnit = "c") {
  return render(
    <SWRConfig value={{ provider: () => new Map() }}>
      <TemperatureUnitProvider unit={unit}>
        <LiveSite siteId={siteId} timeZone="Europe/London" initial={initial}>
          <PlugInForce plugId={plugId} />
        </LiveSite>
      </TemperatureUnitProvider>
    </SWRConfig>,
  );
}

describe("PlugInForce", () => {
  it("says what is in force, until when and what follows, and the guard's wait", () => {
    server.use(http.get("*/api/sites/:siteId/live", () => HttpResponse.json(band)));
    show(band);
    expect(screen.getByText("Band 8–10 °C (Winter days) until 18:00, then frost protection 3–5 °C")).toBeTruthy();
    expect(screen.getByText("Waiting out the minimum on/off time until 12:02")).toBeTruthy();
  });

  it("in the person's unit", () => {
    server.use(http.get("*/api/sites/:siteId/live", () => HttpResponse.json(band)));
    show(band, "f");
    // 8 °C = 46.4 °F, 10 °C = 50 °F, 3 °C = 37.4 °F, 5 °C = 41 °F.
    expect(screen.getByText("Band 46.4–50 °F (Winter days) until 18:00, then frost protection 37.4–41 °F")).toBeTruthy();
  });

  it("follows the live data as it refreshes: an override set from a phone shows with who and why", async () => {
    const overridden = live({
      rule: { kind: "override", on: false, by: "Tam", reason: "Venting after spraying" },
      until: "2030-01-17T07:30:00.000Z",
      next: { kind: "window", mode: "band", lowC: 8, highC: 10, scheduleName: "Winter days" },
      guardUntil: null,
    });
    server.use(http.get("*/api/sites/:siteId/live", () => HttpResponse.json(overridden)));
    show(band);
    await waitFor(() => expect(screen.getByText("Override: off until tomorrow 07:30, then band 8–10 °C (Winter days)")).toBeTruthy());
    expect(screen.getByText("By Tam: Venting after spraying")).toBeTruthy();
    expect(screen.queryByText(/Waiting out/)).toBeNull();
  });

  it("shows nothing for a plug whose plan is not known", () => {
    const unknown = live(null);
    server.use(http.get("*/api/sites/:siteId/live", () => HttpResponse.json(unknown)));
    const { container } = show(unknown);
    expect(container.textContent).toBe("");
  });
});
