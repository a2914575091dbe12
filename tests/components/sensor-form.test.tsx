// The sensor form's placement field: sent with a new sensor and with a change, inside
// unless the person picks outside; the handler's answer (msw) placed on the field.
import { cleanup, fireEvent, render, screen, waitFor } from "@testing-library/react";
import { http, HttpResponse } from "msw";
import { setupServer } from "msw/node";
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { SensorForm } from "@/components/setup/SensorForm";

const push = vi.fn();
vi.mock("next/navigation", () => ({ useRouter: () => ({ push, refresh: vi.fn() }) }));

const SITE = "5b1e7c1a-1111-4c4c-8888-000000000011";
const HOUSE = "5b1e7c1a-1111-4c4c-8888-000000000012";
const SENSOR = "5b1e7c1a-1111-4c4c-8888-000000000013";
const requests: { method: string; body: unknown }[] = [];
let answer: () => Response = () => HttpResponse.json({ sensor: { id: SENSOR } }, { status: 201 });
const server = setupServer(
  http.post(`*/api/sites/${SITE}/sensors`, async ({ request }) => {
    requests.push({ method: "POST", body: await request.json() });
    return answer();
  }),
  http.patch(`*/api/sites/${SITE}/sensors/${SENSOR}`, async ({ request }) => {
    requests.push({ method: "PATCH", body: await request.json() });
    return answer();
  }),
);

beforeAll(() => server.listen({ onUnhandledRequest: "error" }));
afterEach(() => {
  cleanup();
  requests.length = 0;
  push.mockReset();
  answer = () => HttpResponse.json({ sensor: { id: SENSOR } }, { status: 201 });
});
afterAll(() => server.close());

const houses = [{ id: HOUSE, name: "Lean-to" }];
const type = (label: RegExp, value: string) => fireEvent.change(screen.getByLabelText(label), { target: { value } });

describe("SensorForm placement", () => {
  it("adds a sensor inside by default", async () => {
    render(<SensorForm siteId={SITE} slug="plot" houses={houses} />);
    expect((screen.getByRole("radio", { name: /Inside the house/ }) as HTMLInputElement).checked).toBe(true);
    type(/^Name/, "Bench air");
    type(/^Device id/, "bench-air");
    fireEvent.click(screen.getByRole("button", { name: "Add the sensor" }));
    await waitFor(() => expect(requests).toHaveLength(1));
    expect(requests[0]!.body).toEqual({ name: "Bench air", deviceId: "bench-air", houseId: HOUSE, placement: "inside" });
  });

  it("adds an outside sensor when the person picks outside", async () => {
    render(<SensorForm siteId={SITE} slug="plot" houses={houses} />);
    type(/^Name/, "Yard air");
    type(/^Device id/, "yard-air");
    fireEvent.click(screen.getByRole("radio", { name: /Outside/ }));
    fireEvent.click(screen.getByRole("button", { name: "Add the sensor" }));
    await waitFor(() => expect(requests).toHaveLength(1));
    expect(requests[0]!.body).toMatchObject({ placement: "outside" });
    await waitFor(() => expect(push).toHaveBeenCalledWith(`/sites/plot/devices/sensor/${SENSOR}?added=1`));
  });

  it("sends a stored sensor's placement with its change, and shows the handler's refusal on the field", async () => {
    answer = () =>
      HttpResponse.json({ error: { code: "bad_request", message: "Check the fields.", fields: { placement: "Placement must be inside or outside" } } }, { status: 400 });
    render(<SensorForm siteId={SITE} slug="plot" houses={houses} sensor={{ id: SENSOR, name: "Yard air", deviceId: "yard-air", houseId: HOUSE, placement: "outside" }} />);
    expect((screen.getByRole("radio", { name: /Outside/ }) as HTMLInputElement).checked).toBe(true);
    fireEvent.click(screen.getByRole("radio", { name: /Inside the house/ }));
    fireEvent.click(screen.getByRole("button", { name: "Save the sensor" }));
    await waitFor(() => expect(requests).toHaveLength(1));
    expect(requests[0]).toEqual({ method: "PATCH", body: { name: "Yard air", houseId: HOUSE, placement: "inside" } });
    expect((await screen.findByText("Placement must be inside or outside")).textContent).toBe("Placement must be inside or outside");
  });
});
