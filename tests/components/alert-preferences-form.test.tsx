// A member's own alert e-mails: frost risk shown chosen and locked, the kinds and quiet
// hours sent as the shared schema has them (handler stood in for by msw), and a half
// quiet-hours pair refused beside its field before anything is sent.
import { cleanup, fireEvent, render, screen, waitFor } from "@testing-library/react";
import { http, HttpResponse } from "msw";
import { setupServer } from "msw/node";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { AlertPreferencesForm } from "@/components/alerts/AlertPreferencesForm";
import { defaultAlertPreferences } from "@/lib/alerts/preferences";

const SITE = "5b1e7c1a-1111-4c4c-8888-000000000001";
const sent: unknown[] = [];
const server = setupServer(
  http.put(`*/api/sites/${SITE}/alerts/preferences`, async ({ request }) => {
    const body = await request.json();
    sent.push(body);
    return HttpResponse.json({ preferences: body, chosen: true });
  }),
);

beforeAll(() => server.listen({ onUnhandledRequest: "error" }));
afterEach(() => {
  cleanup();
  sent.length = 0;
});
afterAll(() => server.close());

function renderForm() {
  render(<AlertPreferencesForm siteId={SITE} timeZone="Europe/London" preferences={defaultAlertPreferences("helper")} chosen={false} summaryTime={null} />);
}

const save = () => fireEvent.click(screen.getByRole("button", { name: "Save my alert e-mails" }));

describe("AlertPreferencesForm", () => {
  it("shows frost risk chosen and locked: always sent, also in quiet hours", () => {
    renderForm();
    const frost = screen.getByRole("checkbox", { name: /Frost risk/ }) as HTMLInputElement;
    expect(frost.checked).toBe(true);
    expect(frost.disabled).toBe(true);
    expect(screen.getByText("always sent, also in quiet hours")).toBeTruthy();
    expect(screen.getByText(/The owner has not set a time for it yet/)).toBeTruthy();
  });

  it("sends the chosen kinds, quiet hours over midnight and the summary choice", async () => {
    renderForm();
    fireEvent.click(screen.getByRole("checkbox", { name: /Condensation risk/ }));
    fireEvent.click(screen.getByRole("checkbox", { name: /^Too warm/ }));
    fireEvent.change(screen.getByLabelText("From"), { target: { value: "22:00" } });
    fireEvent.change(screen.getByLabelText("Until"), { target: { value: "07:00" } });
    fireEvent.click(screen.getByRole("checkbox", { name: "Send me the daily summary" }));
    save();
    await waitFor(() => expect(sent).toHaveLength(1));
    const { kinds, ...rest } = sent[0] as { kinds: string[] };
    expect([...kinds].sort()).toEqual(["condensation", "controller_silent", "heater_long_on", "plug_offline", "too_hot"]);
    expect(rest).toEqual({
      quietFrom: "22:00",
      quietUntil: "07:00",
      dailySummary: true,
    });
  });

  it("refuses quiet hours with one end only, beside the missing end, and sends nothing", async () => {
    renderForm();
    fireEvent.change(screen.getByLabelText("From"), { target: { value: "22:00" } });
    save();
    expect(await screen.findByText("Give both ends of the quiet hours, or neither")).toBeTruthy();
    expect(screen.getByLabelText("Until").getAttribute("aria-invalid")).toBe("true");
    expect(sent).toEqual([]);

    fireEvent.click(screen.getByRole("button", { name: "No quiet hours" }));
    save();
    await waitFor(() => expect(sent).toHaveLength(1));
    expect(sent[0]).toMatchObject({ quietFrom: null, quietUntil: null });
  });
});
