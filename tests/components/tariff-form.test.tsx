// The tariff editor: a time-of-use tariff typed rate by rate, its week checked as the
// reports read it before anything is sent, and the handler (stood in for by msw)
// given the tariff whole; a refusal from the handler is shown beside the button.
import { cleanup, fireEvent, render, screen, waitFor, within } from "@testing-library/react";
import { http, HttpResponse } from "msw";
import { setupServer } from "msw/node";
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { TariffForm, blankTariff } from "@/components/tariffs/TariffForm";

const SITE = "5b1e7c1a-1111-4c4c-8888-000000000001";
const sent: unknown[] = [];
let answer: () => Response = () => HttpResponse.json({ tariff: { id: "t1" }, reportsUpdated: true }, { status: 201 });
const server = setupServer(
  http.post(`*/api/sites/${SITE}/tariffs`, async ({ request }) => {
    sent.push(await request.json());
    return answer();
  }),
);

beforeAll(() => server.listen({ onUnhandledRequest: "error" }));
afterEach(() => {
  cleanup();
  sent.length = 0;
});
afterAll(() => server.close());

const type = (el: HTMLElement, value: string) => fireEvent.change(el, { target: { value } });

function renderForm(onSaved = vi.fn()) {
  render(<TariffForm siteId={SITE} currency="GBP" initial={blankTariff("2027-01-01")} onSaved={onSaved} onCancel={vi.fn()} />);
  type(screen.getByLabelText(/^Name/), "Night saver");
  type(screen.getByLabelText(/^Standing charge per day \(£\)/), "0.6");
  fireEvent.click(screen.getByLabelText(/Time of use/));
  // The all-day rate stays as rate 1; it becomes the night rate, and a day rate is added.
  type(screen.getByLabelText("Rate 1 name"), "Night");
  type(screen.getAllByLabelText("Starts")[0]!, "23:00");
  type(screen.getAllByLabelText("Ends")[0]!, "07:00");
  type(screen.getAllByLabelText(/^Price per kWh/)[0]!, "0.12");
  fireEvent.click(screen.getByRole("button", { name: "Add a rate" }));
  type(screen.getByLabelText("Rate 2 name"), "Day");
  type(screen.getAllByLabelText("Starts")[1]!, "07:00");
  type(screen.getAllByLabelText("Ends")[1]!, "22:00");
  type(screen.getAllByLabelText(/^Price per kWh/)[1]!, "0.3");
  return onSaved;
}

describe("TariffForm", () => {
  it("names the hour no rate covers, and sends nothing until the week is covered once", async () => {
    const onSaved = renderForm();
    expect(await screen.findByText("No rate covers 22:00–23:00 (Every day).")).toBeTruthy();
    fireEvent.click(screen.getByRole("button", { name: "Add tariff" }));
    await new Promise((resolve) => setTimeout(resolve, 100));
    expect(sent).toEqual([]);

    type(screen.getAllByLabelText("Ends")[1]!, "23:00");
    expect(await screen.findByText("Every hour of the week has one rate.")).toBeTruthy();
    fireEvent.click(screen.getByRole("button", { name: "Add tariff" }));
    await waitFor(() => expect(onSaved).toHaveBeenCalledWith("Saved “Night saver”. Reports now cost its dates with it."));
    expect(sent).toEqual([
      {
        name: "Night saver",
        kind: "time_of_use",
        validFrom: "2027-01-01",
        validUntil: null,
        standingChargePerDay: 0.6,
        taxPercent: 0,
        rates: [
          { label: "Night", startsAt: "23:00", endsAt: "07:00", days: ["MO", "TU", "WE", "TH", "FR", "SA", "SU"], pricePerKwh: 0.12 },
          { label: "Day", startsAt: "07:00", endsAt: "23:00", days: ["MO", "TU", "WE", "TH", "FR", "SA", "SU"], pricePerKwh: 0.3 },
        ],
      },
    ]);
  });

  it("shows the handler's refusal (dates overlapping another tariff) beside the button and on the field", async () => {
    const message = "These dates overlap “Two-rate economy” (from 1 Jan 2026, no end date). A site has one tariff on each day: give that one an end date first, or choose other dates.";
    answer = () => HttpResponse.json({ error: { code: "conflict", message, fields: { validFrom: message } } }, { status: 409 });
    const onSaved = renderForm();
    type(screen.getAllByLabelText("Ends")[1]!, "23:00");
    fireEvent.click(screen.getByRole("button", { name: "Add tariff" }));
    const alert = await screen.findByRole("alert");
    expect(within(alert).getByText(`Not saved: ${message}`)).toBeTruthy();
    expect(screen.getAllByText(message)).toHaveLength(1);
    expect(onSaved).not.toHaveBeenCalled();
  });
});
