// One alert on the alerts page: its figures in the reader's unit, where each e-mail
// stands (sent, held, retrying, skipped, given up) in the site's zone, and the
// Acknowledge button for those who may (handler stood in for by msw).
import { cleanup, fireEvent, render, screen, waitFor } from "@testing-library/react";
import { http, HttpResponse } from "msw";
import { setupServer } from "msw/node";
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { AlertCard } from "@/components/alerts/AlertCard";
import type { AlertJson, DeliveryJson } from "@/components/alerts/alert-words";
import { TemperatureUnitProvider } from "@/components/site/TemperatureUnit";

const SITE = "5b1e7c1a-1111-4c4c-8888-000000000001";
const posted: string[] = [];
const server = setupServer(
  http.post(`*/api/sites/${SITE}/alerts/:alertId/acknowledge`, ({ params }) => {
    posted.push(String(params.alertId));
    return HttpResponse.json({ acknowledgement: { alertId: 7, acknowledgedAt: "2026-01-12T02:31:00.000Z", acknowledgedBy: "Ann", already: false } });
  }),
);
beforeAll(() => server.listen({ onUnhandledRequest: "error" }));
afterEach(() => {
  cleanup();
  posted.length = 0;
});
afterAll(() => server.close());

const mail = (values: Partial<DeliveryJson>): DeliveryJson => ({
  id: Math.floor(Math.random() * 1e9),
  purpose: "alert_raised",
  to: "ann@test.example",
  name: "Ann",
  status: "sent",
  attempts: 1,
  lastError: null,
  dueAt: "2026-01-12T02:10:00.000Z",
  sentAt: "2026-01-12T02:13:00.000Z",
  ...values,
});

const frost: AlertJson = {
  id: 7,
  kind: "too_cold",
  message: "Colder than the frost alert temperature",
  detail: { valueC: 1.4, limitC: 3, lastedMin: 2 },
  house: { id: "h", name: "Glasshouse" },
  sensor: { id: "s", name: "Bench sensor" },
  plug: null,
  raisedAt: "2026-01-12T02:10:00.000Z",
  clearedAt: null,
  clearedMessage: null,
  acknowledgedAt: null,
  acknowledgedBy: null,
  deliveries: [
    mail({}),
    mail({ to: "ben@test.example", name: "Ben", status: "waiting", attempts: 3, lastError: "Connection refused", dueAt: "2026-01-12T02:20:00.000Z", sentAt: null }),
    mail({ to: "cat@test.example", name: null, purpose: "alert_reminder", status: "held", attempts: 0, dueAt: "2026-01-12T07:00:00.000Z", sentAt: null }),
    mail({ status: "skipped", attempts: 0, lastError: "back to normal before quiet hours ended", sentAt: null }),
    mail({ status: "given_up", attempts: 12, lastError: "Mailbox unavailable", sentAt: null }),
  ],
};

// London is on GMT in January, so its clock reads UTC.
const NOW = new Date("2026-01-12T02:30:00Z");

function renderCard(alert: AlertJson, canAcknowledge = true, onChanged = vi.fn()) {
  render(
    <TemperatureUnitProvider unit="f">
      <ul>
        <AlertCard alert={alert} siteId={SITE} timeZone="Europe/London" now={NOW} canAcknowledge={canAcknowledge} onChanged={onChanged} />
      </ul>
    </TemperatureUnitProvider>,
  );
  return onChanged;
}

describe("AlertCard", () => {
  it("shows the figures in °F and every e-mail's state, opened because some are not through", () => {
    renderCard(frost);
    // 1.4 °C = 34.5 °F and 3 °C = 37.4 °F (F = C × 9/5 + 32).
    expect(screen.getByText("Reading 34.5 °F, limit 37.4 °F")).toBeTruthy();
    expect(screen.getByText(/Raised/).textContent).toBe("Raised 02:10 (20 min ago)");
    const mails = screen.getAllByRole("listitem").map((li) => li.textContent);
    expect(mails).toEqual(
      expect.arrayContaining([
        "Alert to Ann (ann@test.example): sent 02:13",
        "Alert to Ben (ben@test.example): not sent yet: 3 tries, last: Connection refused, next try 02:20",
        "Reminder to cat@test.example: held for quiet hours until 07:00",
        "Alert to Ann (ann@test.example): skipped: back to normal before quiet hours ended",
        "Alert to Ann (ann@test.example): given up after 12 tries, last: Mailbox unavailable",
      ]),
    );
    expect(screen.getByText(/E-mails: 1 of 5 sent/).closest("details")!.open).toBe(true);
  });

  it("acknowledges for those who may, and offers no button to others or on a seen alert", async () => {
    const onChanged = renderCard(frost);
    fireEvent.click(screen.getByRole("button", { name: "Acknowledge" }));
    await waitFor(() => expect(onChanged).toHaveBeenCalled());
    expect(posted).toEqual(["7"]);
    cleanup();

    renderCard(frost, false);
    expect(screen.queryByRole("button", { name: "Acknowledge" })).toBeNull();
    cleanup();

    renderCard({ ...frost, acknowledgedAt: "2026-01-12T02:15:00.000Z", acknowledgedBy: "Ben" });
    expect(screen.getByText(/Acknowledged by Ben at/).textContent).toBe("Acknowledged by Ben at 02:15");
    expect(screen.queryByRole("button", { name: "Acknowledge" })).toBeNull();
  });

  it("shows a past alert back to normal with what the reading was then", () => {
    renderCard({
      ...frost,
      deliveries: [mail({})],
      clearedAt: "2026-01-12T02:25:00.000Z",
      clearedMessage: "Back above the frost alert temperature",
      detail: { ...frost.detail, cleared: { valueC: 4, at: "2026-01-12T02:25:00.000Z" } },
    });
    // 4 °C = 39.2 °F.
    expect(screen.getByText(/^Back to normal/, { selector: "p" }).textContent).toBe("Back to normal 02:25: Back above the frost alert temperature (39.2 °F)");
    expect(screen.queryByRole("button", { name: "Acknowledge" })).toBeNull();
    expect(screen.getByText(/E-mails: 1 of 1 sent/).closest("details")!.open).toBe(false);
  });
});
