// The house form in the person's unit: limits are shown and typed in °F and reach the
// handler (stood in for by msw) in °C; the rules are checked on the converted values.
import { cleanup, fireEvent, render, screen, waitFor } from "@testing-library/react";
import { http, HttpResponse } from "msw";
import { setupServer } from "msw/node";
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { HouseForm } from "@/components/setup/HouseForm";
import { TemperatureUnitProvider } from "@/components/site/TemperatureUnit";

const push = vi.fn();
vi.mock("next/navigation", () => ({ useRouter: () => ({ push, refresh: vi.fn() }) }));

const SITE = "5b1e7c1a-1111-4c4c-8888-000000000001";
const sent: unknown[] = [];
const server = setupServer(
  http.post(`*/api/sites/${SITE}/houses`, async ({ request }) => {
    sent.push(await request.json());
    return HttpResponse.json({ house: { id: "h1" } }, { status: 201 });
  }),
);

beforeAll(() => server.listen({ onUnhandledRequest: "error" }));
afterEach(() => {
  cleanup();
  sent.length = 0;
  push.mockReset();
});
afterAll(() => server.close());

function fill(values: Record<string, string>) {
  for (const [label, value] of Object.entries(values)) fireEvent.change(screen.getByLabelText(new RegExp(`^${label}`)), { target: { value } });
}

const shape = { Name: "Lean-to", "Length": "4", "Width": "2.5", "Eave height": "2", "Ridge height": "2.6" };

describe("HouseForm in °F", () => {
  it("shows the default limits in °F and sends what is typed in °C", async () => {
    render(
      <TemperatureUnitProvider unit="f">
        <HouseForm siteId={SITE} slug="plot" />
      </TemperatureUnitProvider>,
    );
    // 2 °C = 35.6 °F and 35 °C = 95 °F (F = C × 9/5 + 32).
    expect((screen.getByLabelText(/^Low limit \(frost\) \(°F\)/) as HTMLInputElement).value).toBe("35.6");
    expect((screen.getByLabelText(/^High limit \(cut-out\) \(°F\)/) as HTMLInputElement).value).toBe("95");
    fill({ ...shape, "Low limit": "41", "High limit": "86" });
    fireEvent.click(screen.getByRole("button", { name: "Add the house" }));
    await waitFor(() => expect(push).toHaveBeenCalledWith("/sites/plot/houses/h1?added=1"));
    // 41 °F = 5 °C, 86 °F = 30 °C.
    expect(sent).toEqual([expect.objectContaining({ name: "Lean-to", lowLimitC: 5, highLimitC: 30, ridgeHeightM: 2.6 })]);
  });

  it("checks the limits after converting: low at or above high is refused, nothing sent", async () => {
    render(
      <TemperatureUnitProvider unit="f">
        <HouseForm siteId={SITE} slug="plot" />
      </TemperatureUnitProvider>,
    );
    fill({ ...shape, "Low limit": "70", "High limit": "68" });
    fireEvent.click(screen.getByRole("button", { name: "Add the house" }));
    expect(await screen.findByText("Low limit (frost) must be below the high limit (cut-out)")).toBeTruthy();
    expect(sent).toEqual([]);
  });
});
