// The override control's confirmation states: the API stood in for by msw, the plug's
// event stream by a fake EventSource that the test drives.
import { act, cleanup, fireEvent, render, screen, waitFor } from "@testing-library/react";
import { http, HttpResponse } from "msw";
import { setupServer } from "msw/node";
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { SWRConfig } from "swr";
import { OverrideScreen } from "@/components/override/OverrideScreen";
import type { OverridePanelJson, OverrideViewJson } from "@/components/override/panel-data";

const SITE = "11111111-1111-4111-8111-111111111111";
const PLUG = "22222222-2222-4222-8222-222222222222";
const START = "2026-01-10T12:00:00.000Z";

class FakeEventSource {
  static last: FakeEventSource | null = null;
  onerror: (() => void) | null = null;
  private listeners = new Map<string, ((e: MessageEvent<string>) => void)[]>();
  constructor(readonly url: string) {
    FakeEventSource.last = this;
  }
  addEventListener(name: string, listener: (e: MessageEvent<string>) => void) {
    this.listeners.set(name, [...(this.listeners.get(name) ?? []), listener]);
  }
  close() {}
  emit(name: string, data: unknown) {
    act(() => {
      for (const l of this.listeners.get(name) ?? []) l(new MessageEvent(name, { data: JSON.stringify(data) }));
    });
  }
}

function panel(active: OverrideViewJson | null, reportedOn = false): OverridePanelJson {
  return {
    at: START,
    plug: { id: PLUG, deviceId: "heater-1", name: "Bench heater", houseId: "h", houseName: "Long house", applianceKind: "heater", minOnS: 0, minOffS: 0, retiredAt: null },
    now: { online: true, lastSeenAt: START, on: reportedOn, since: START, cause: "schedule", presentCause: "schedule", pendingOn: null, pendingSince: null, guardUntil: null, reportedOn, reportedAt: START },
    nextChangeAt: "2026-01-10T18:00:00.000Z",
    active,
    recent: active ? [active] : [],
  };
}

let created: OverrideViewJson | null = null;
const server = setupServer(
  http.get(`*/api/sites/${SITE}/plugs/${PLUG}/overrides`, () => HttpResponse.json(panel(created))),
  http.post(`*/api/sites/${SITE}/plugs/${PLUG}/overrides`, async ({ request }) => {
    const body = (await request.json()) as { on: boolean };
    const startsAt = new Date(Date.now()).toISOString();
    created = { id: "o1", on: body.on, startsAt, endsAt: null, untilNextChange: false, stopsAt: null, reason: "", byName: "Hazel", cancelledAt: null, cancelledByName: null, active: true };
    return HttpResponse.json({ override: { id: "o1", startsAt, stopsAt: null } }, { status: 201 });
  }),
);

beforeAll(() => server.listen({ onUnhandledRequest: "error" }));
afterAll(() => server.close());
beforeEach(() => {
  created = null;
  vi.stubGlobal("EventSource", FakeEventSource);
});
afterEach(() => {
  cleanup();
  vi.useRealTimers();
  vi.unstubAllGlobals();
  server.resetHandlers();
});

function show(canCreate = true) {
  render(
    <SWRConfig value={{ provider: () => new Map(), dedupingInterval: 0 }}>
      <OverrideScreen siteId={SITE} timeZone="Europe/London" initial={panel(null)} canCreate={canCreate} canCancel={canCreate} />
    </SWRConfig>,
  );
  const source = FakeEventSource.last!;
  source.emit("hello", { live: true, serverNow: Date.now(), report: { on: false, receivedAt: Date.now() - 60_000 }, presence: { online: true } });
  return source;
}

const confirmation = () => document.querySelector("[data-confirmation]")?.getAttribute("data-confirmation");

describe("the override control", () => {
  it("shows a press as waiting until the plug's own report confirms it", async () => {
    const source = show();
    fireEvent.click(screen.getByRole("button", { name: "Switch on" }));
    await waitFor(() => expect(confirmation()).toBe("waiting"));
    expect(screen.getByText(/waiting for the plug to report on/)).toBeTruthy();
    // A report of the old state does not confirm it.
    source.emit("report", { type: "report", on: false, receivedAt: Date.now() });
    expect(confirmation()).toBe("waiting");
    source.emit("report", { type: "report", on: true, receivedAt: Date.now() });
    await waitFor(() => expect(confirmation()).toBe("confirmed"));
    expect(screen.getByText("Confirmed: the plug reports on.")).toBeTruthy();
  });

  it("a plug already in the state asked for is confirmed at once", async () => {
    show();
    fireEvent.click(screen.getByRole("button", { name: "Switch off" }));
    await waitFor(() => expect(confirmation()).toBe("confirmed"));
    expect(screen.getByText("Confirmed: the plug was already off.")).toBeTruthy();
  });

  it("says plainly when the plug is offline", async () => {
    const source = show();
    fireEvent.click(screen.getByRole("button", { name: "Switch on" }));
    await waitFor(() => expect(confirmation()).toBe("waiting"));
    source.emit("presence", { type: "presence", online: false, receivedAt: Date.now() });
    await waitFor(() => expect(confirmation()).toBe("offline"));
    expect(screen.getByText(/The plug is offline: it has not confirmed/)).toBeTruthy();
  });

  it("says plainly when the plug has not answered within 10 s", async () => {
    vi.useFakeTimers({ toFake: ["Date", "setInterval", "clearInterval"], shouldAdvanceTime: true });
    show();
    fireEvent.click(screen.getByRole("button", { name: "Switch on" }));
    await waitFor(() => expect(confirmation()).toBe("waiting"));
    act(() => vi.advanceTimersByTime(10_500));
    await waitFor(() => expect(confirmation()).toBe("no_answer"));
    expect(screen.getByText(/has not answered in 10 s/)).toBeTruthy();
  });

  it("a viewer sees the state but no controls", () => {
    show(false);
    expect(screen.getByText("Off")).toBeTruthy();
    expect(screen.queryByRole("button", { name: "Switch on" })).toBeNull();
    expect(screen.getByText(/lets you see this plug but not switch it/)).toBeTruthy();
  });
});
