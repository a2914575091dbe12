// The schedule editor's week grid with the keyboard, the list view's actions and the
// save, with msw standing in for the plan and preview handlers.
import { act, cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { http, HttpResponse } from "msw";
import { setupServer } from "msw/node";
import type { AnchorHTMLAttributes } from "react";
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { ScheduleEditor } from "@/components/schedules/ScheduleEditor";
import { TemperatureUnitProvider } from "@/components/site/TemperatureUnit";
import type { PlanInput } from "@/lib/schemas/schedule";

vi.mock("next/link", () => ({ default: ({ href, ...rest }: AnchorHTMLAttributes<HTMLAnchorElement>) => <a href={href} {...rest} /> }));

const SITE = "6f1f3c52-1d1e-4c55-9a1c-3c5f9d7d2a01";
const PLUG = "8a3e2b11-5c6d-4e7f-8a9b-0c1d2e3f4a5b";
const plan: PlanInput = {
  name: "Winter days",
  windows: [{ id: "1b2c3d4e-5f60-4718-8293-a4b5c6d7e8f9", days: ["MO", "TU"], start: "06:00", durationMin: 15 * 60, mode: "band", lowC: 8, highC: 10 }],
  outsideWindows: "frost",
  frostLowC: 3,
  frostHighC: 5,
  validFrom: null,
  validUntil: null,
  skipDays: [],
};

let saved: unknown = null;
const server = setupServer(
  http.post(`/api/sites/${SITE}/plugs/${PLUG}/schedule/preview`, () =>
    HttpResponse.json({ timeZone: "Europe/London", from: "2027-01-04T00:00:00.000Z", until: "2027-01-05T00:00:00.000Z", segments: [], clockChanges: [] }),
  ),
  http.put(`/api/sites/${SITE}/plugs/${PLUG}/schedule`, async ({ request }) => {
    saved = await request.json();
    return HttpResponse.json({ plan: saved });
  }),
);

beforeAll(() => server.listen({ onUnhandledRequest: "error" }));
afterEach(() => {
  cleanup();
  saved = null;
});
afterAll(() => server.close());

function renderEditor(canEdit = true, unit: "c" | "f" = "c", initial = plan) {
  return render(
    <TemperatureUnitProvider unit={unit}>
      <ScheduleEditor
        siteId={SITE}
        siteSlug="fernhollow"
        timeZone="Europe/London"
        plug={{ id: PLUG, name: "Glasshouse heater", houseName: "Long Glasshouse", applianceKind: "heater", lowLimitC: 2, highLimitC: 35 }}
        initial={initial}
        scheduleCount={1}
        unreadable={0}
        canEdit={canEdit}
      />
    </TemperatureUnitProvider>,
  );
}

const mondayBlock = () => screen.getByRole("button", { name: /^Window 1: Monday/ });
const announced = () => screen.getAllByRole("status").map((s) => s.textContent).join(" ");

describe("the week grid with the keyboard", () => {
  it("arrows move a window 15 minutes or a day, shift+arrows resize it, and each change is announced", () => {
    renderEditor();
    expect(screen.getByText(/Times are Europe\/London/)).toBeTruthy();
    expect(screen.getByRole("button", { name: "Window 1: Monday, 06:00–21:00, 8–10 °C" })).toBe(mondayBlock());

    mondayBlock().focus();
    fireEvent.keyDown(mondayBlock(), { key: "ArrowDown" });
    expect(screen.getByRole("button", { name: "Window 1: Monday, 06:15–21:15, 8–10 °C" })).toBe(mondayBlock());
    expect(announced()).toContain("Moved: Mon, Tue 06:15–21:15, 8–10 °C");
    // The keyboard stays on the window it moved.
    expect(document.activeElement).toBe(mondayBlock());

    fireEvent.keyDown(mondayBlock(), { key: "ArrowDown", shiftKey: true });
    expect(screen.getByRole("button", { name: "Window 1: Monday, 06:15–21:30, 8–10 °C" })).toBe(mondayBlock());
    expect(announced()).toContain("Resized");

    fireEvent.keyDown(mondayBlock(), { key: "ArrowUp", shiftKey: true });
    fireEvent.keyDown(mondayBlock(), { key: "ArrowUp", shiftKey: true });
    expect(screen.getByRole("button", { name: "Window 1: Monday, 06:15–21:00, 8–10 °C" })).toBe(mondayBlock());

    // Monday's opening moves to Tuesday (and Tuesday's to Wednesday); the keyboard follows it.
    fireEvent.keyDown(mondayBlock(), { key: "ArrowRight" });
    expect(screen.queryByRole("button", { name: /^Window 1: Monday/ })).toBeNull();
    expect(document.activeElement).toBe(screen.getByRole("button", { name: /^Window 1: Tuesday/ }));
    expect(screen.getByRole("button", { name: /^Window 1: Wednesday/ })).toBeTruthy();
    expect(screen.getByText("Unsaved changes")).toBeTruthy();
  });

  it("moving before midnight takes the window to the day before", () => {
    renderEditor(true, "c", { ...plan, windows: [{ ...plan.windows[0]!, start: "00:30", durationMin: 120 }] });
    for (let i = 0; i < 3; i++) fireEvent.keyDown(document.activeElement === document.body ? mondayBlock() : document.activeElement!, { key: "ArrowUp" });
    // 00:30 − 3 × 15 min = Sunday 23:45, running into Monday; Monday's window moves to Sunday, Tuesday's to Monday.
    expect(screen.getByRole("button", { name: "Window 1: Sunday, 23:45–01:45 next day, 8–10 °C" })).toBeTruthy();
    expect(screen.getAllByRole("button", { name: /^Window 1: Monday, 23:45–01:45 next day/ })).toHaveLength(1);
  });

  it("Enter opens the window's form with its values in the person's unit; Delete removes it", async () => {
    renderEditor(true, "f");
    fireEvent.keyDown(mondayBlock(), { key: "Enter" });
    const form = screen.getByRole("form", { name: "Window 1" });
    expect((within(form).getByLabelText("Low edge (°F)") as HTMLInputElement).value).toBe("46.4");
    expect((within(form).getByLabelText("Ends at") as HTMLInputElement).value).toBe("21:00");
    fireEvent.click(within(form).getByRole("button", { name: "Cancel" }));

    fireEvent.keyDown(mondayBlock(), { key: "Delete" });
    expect(screen.queryByRole("button", { name: /^Window 1:/ })).toBeNull();
    expect(announced()).toContain("Removed Mon, Tue 06:00–21:00, 46.4–50 °F");
  });

  it("save sends the whole plan as moved and reports it saved", async () => {
    renderEditor();
    fireEvent.keyDown(mondayBlock(), { key: "ArrowDown" });
    await act(async () => {
      fireEvent.click(screen.getByRole("button", { name: "Save plan" }));
    });
    await vi.waitFor(() => expect(saved).not.toBeNull());
    expect(saved).toEqual({ ...plan, windows: [{ ...plan.windows[0], start: "06:15" }] });
    await screen.findByText(/Saved\. The controller has been told/);
  });

  it("an overlap is shown on the window and blocks the save", async () => {
    renderEditor();
    fireEvent.click(screen.getAllByRole("button", { name: "Add a window on Tuesday" })[0]!);
    const form = screen.getByRole("form", { name: "New window" });
    fireEvent.change(within(form).getByLabelText("Starts at"), { target: { value: "20:00" } });
    fireEvent.change(within(form).getByLabelText("Ends at"), { target: { value: "23:00" } });
    await act(async () => {
      fireEvent.click(within(form).getByRole("button", { name: "Keep this window" }));
    });
    expect(await screen.findByText(/Runs at the same time as window 1 \(Mon, Tue 06:00–21:00\) on Tuesday/)).toBeTruthy();
    await act(async () => {
      fireEvent.click(screen.getByRole("button", { name: "Save plan" }));
    });
    expect(saved).toBeNull();
    expect(screen.getByText(/The plan has problems/)).toBeTruthy();
  });
});

describe("read-only", () => {
  it("a viewer sees the windows but no way to change them", () => {
    renderEditor(false);
    fireEvent.keyDown(mondayBlock(), { key: "ArrowDown" });
    expect(screen.getByRole("button", { name: "Window 1: Monday, 06:00–21:00, 8–10 °C" })).toBe(mondayBlock());
    expect(screen.queryByRole("button", { name: "Save plan" })).toBeNull();
    expect(screen.queryByRole("button", { name: /Add a window/ })).toBeNull();
  });
});
