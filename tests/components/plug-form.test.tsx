// The plug form's continuous-load check as the person types, the cautions where a
// heater is assigned, and the handler's answers (stood in for by msw) placed on fields.
import { cleanup, fireEvent, render, screen, waitFor } from "@testing-library/react";
import { http, HttpResponse } from "msw";
import { setupServer } from "msw/node";
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { PlugForm } from "@/components/setup/PlugForm";

const push = vi.fn();
vi.mock("next/navigation", () => ({ useRouter: () => ({ push, refresh: vi.fn() }) }));

const SITE = "5b1e7c1a-1111-4c4c-8888-000000000001";
const HOUSE = "5b1e7c1a-1111-4c4c-8888-000000000002";
const requests: unknown[] = [];
let answer: () => Response = () => HttpResponse.json({ plug: { id: "new-plug" } }, { status: 201 });
const server = setupServer(
  http.post(`*/api/sites/${SITE}/plugs`, async ({ request }) => {
    requests.push(await request.json());
    return answer();
  }),
);

beforeAll(() => server.listen({ onUnhandledRequest: "error" }));
afterEach(() => {
  cleanup();
  requests.length = 0;
  push.mockReset();
});
afterAll(() => server.close());

function renderForm(mains = { mainsVoltage: 230, continuousLoadPercent: 80 }) {
  render(<PlugForm siteId={SITE} slug="plot" mains={mains} houses={[{ id: HOUSE, name: "Lean-to" }]} sensors={[]} />);
  const type = (label: RegExp, value: string) => fireEvent.change(screen.getByLabelText(label), { target: { value } });
  type(/^Name/, "Lean-to heater");
  type(/^Device id/, "lean-to-heater");
  return type;
}

const loadStatus = () => screen.getAllByRole("status").map((s) => s.textContent ?? "").find((t) => /draws|Enter the appliance/.test(t)) ?? "";

describe("PlugForm", () => {
  it("checks the load live against the plug's continuous rating", async () => {
    const type = renderForm();
    expect(loadStatus()).toMatch(/Enter the appliance’s watts/);
    type(/^Plug rating/, "13");
    type(/^Rated power/, "2000");
    // 2000 W / 230 V ≈ 8.7 A; 80 % of 13 A = 10.4 A (NEC 210.19(A)/210.20(A)'s margin).
    await waitFor(() => expect(loadStatus()).toMatch(/Within the plug’s continuous rating.*about 8\.7 A.*10\.4 A for hours \(80 % of 13 A\)/));
    type(/^Rated power/, "2300");
    // 2300 / 230 = 10 A: within, but above nine tenths of 10.4 A.
    await waitFor(() => expect(loadStatus()).toMatch(/little margin/));
    type(/^Rated power/, "3000");
    await waitFor(() => expect(loadStatus()).toMatch(/Too much for this plug.*about 13 A/));
  });

  it("shows the cautions opened where a heater is assigned", () => {
    renderForm({ mainsVoltage: 120, continuousLoadPercent: 80 });
    const note = screen.getByText(/read before you plug in/).closest("details")!;
    expect(note.open).toBe(true);
    expect(note.textContent).toMatch(/outdoor-rated sockets.*RCD \(GFCI\)/);
    expect(note.textContent).toMatch(/within 80 % of that rating/);
    expect(note.textContent).toMatch(/plants, water, and anything that can burn/);
    expect(note.textContent).toMatch(/licensed electrician/);
    expect(note.textContent).toMatch(/not a safety device/);
  });

  it("does not send a load over the limit, and says why on the watts field", async () => {
    const type = renderForm();
    type(/^Plug rating/, "10");
    type(/^Rated power/, "2500");
    fireEvent.click(screen.getByRole("button", { name: "Add the plug" }));
    expect(await screen.findByText(/draws more than the plug may carry for hours \(80 % of its rating at 230 V\)/)).toBeTruthy();
    expect(requests).toEqual([]);
  });

  it("sends a good plug in the schema's shape and opens its page", async () => {
    const type = renderForm();
    type(/^Plug rating/, "13");
    type(/^Rated power/, "1500");
    fireEvent.click(screen.getByRole("button", { name: "Add the plug" }));
    await waitFor(() => expect(push).toHaveBeenCalledWith("/sites/plot/devices/plug/new-plug?added=1"));
    expect(requests).toEqual([
      expect.objectContaining({ deviceId: "lean-to-heater", houseId: HOUSE, applianceWatts: 1500, ratedCurrentA: 13, sensorId: null, failsafe: "off", failsafeDutyPercent: null }),
    ]);
  });

  it("puts the handler's 409 on the device id field", async () => {
    answer = () =>
      HttpResponse.json(
        { error: { code: "conflict", message: "Device id “lean-to-heater” is already used in this site; choose another.", fields: { deviceId: "is already used in this site" } } },
        { status: 409 },
      );
    const type = renderForm();
    type(/^Plug rating/, "13");
    type(/^Rated power/, "1500");
    fireEvent.click(screen.getByRole("button", { name: "Add the plug" }));
    expect(await screen.findByText("is already used in this site")).toBeTruthy();
    expect(screen.getByLabelText(/^Device id/).getAttribute("aria-invalid")).toBe("true");
    expect(push).not.toHaveBeenCalled();
  });
});
