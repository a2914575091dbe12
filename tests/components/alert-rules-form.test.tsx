// A house's alert rules typed in °F: thresholds shown and typed in °F reach the handler
// (stood in for by msw) in °C, the hysteresis and dew-point margin as differences (no
// 32° offset), the words follow what is typed, and others only read.
import { cleanup, fireEvent, render, screen, waitFor } from "@testing-library/react";
import { http, HttpResponse } from "msw";
import { setupServer } from "msw/node";
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { AlertRulesForm } from "@/components/alerts/AlertRulesForm";
import { TemperatureUnitProvider } from "@/components/site/TemperatureUnit";
import { DEFAULT_ALERT_RULES, type AlertRules } from "@/lib/alerts/rules";

vi.mock("next/navigation", () => ({ useRouter: () => ({ refresh: vi.fn() }) }));

const SITE = "5b1e7c1a-1111-4c4c-8888-000000000001";
const HOUSE = "5b1e7c1a-2222-4c4c-8888-000000000002";
const sent: AlertRules[] = [];
const server = setupServer(
  http.put(`*/api/sites/${SITE}/alerts/rules/${HOUSE}`, async ({ request }) => {
    const rules = (await request.json()) as AlertRules;
    sent.push(rules);
    return HttpResponse.json({ house: { houseId: HOUSE, name: "Glasshouse", lowLimitC: 2, rules, saved: true } });
  }),
);

beforeAll(() => server.listen({ onUnhandledRequest: "error" }));
afterEach(() => {
  cleanup();
  sent.length = 0;
});
afterAll(() => server.close());

const type = (label: RegExp, value: string) => fireEvent.change(screen.getByLabelText(label), { target: { value } });
const valueOf = (label: RegExp) => (screen.getByLabelText(label) as HTMLInputElement).value;

function renderForm(canEdit = true, rules: AlertRules = DEFAULT_ALERT_RULES) {
  render(
    <TemperatureUnitProvider unit="f">
      <AlertRulesForm siteId={SITE} house={{ houseId: HOUSE, name: "Glasshouse", lowLimitC: 2, rules, saved: false }} canEdit={canEdit} />
    </TemperatureUnitProvider>,
  );
}

describe("AlertRulesForm in °F", () => {
  it("shows the rules in °F, differences without the offset, and sends °C", async () => {
    renderForm();
    // F = C × 9/5 + 32: 32 °C = 89.6 °F, the house's 2 °C frost limit = 35.6 °F.
    expect(valueOf(/^Too warm above \(°F\)/)).toBe("89.6");
    expect(screen.getByLabelText(/Follow the house’s frost limit \(35\.6 °F\)/)).toBeTruthy();
    // A difference scales by 9/5 only: 0.5 K = 0.9 °F, 1 K = 1.8 °F.
    expect(valueOf(/^Hysteresis \(°F difference\)/)).toBe("0.9");
    expect(valueOf(/^Margin to the dew point \(°F difference\)/)).toBe("1.8");

    fireEvent.click(screen.getByLabelText("Its own temperature"));
    type(/^Frost alert below \(°F\)/, "34");
    type(/^Too warm above \(°F\)/, "95");
    type(/^Hysteresis \(°F difference\)/, "1.8");
    // The words follow: 95 °F less a 1.8 °F hysteresis.
    expect(await screen.findByText(/closes once back below 93\.2 °F \(hysteresis\)/)).toBeTruthy();
    expect(screen.getByText(/stayed at or below 34 °F for 2 min \(minimum duration\); closes once back above 35\.8 °F/)).toBeTruthy();

    fireEvent.click(screen.getByRole("button", { name: "Save rules for Glasshouse" }));
    await waitFor(() => expect(sent).toHaveLength(1));
    // 34 °F = 1.1 °C, 95 °F = 35 °C, 1.8 °F difference = 1 K; the untouched dew margin stays 1 K.
    expect(sent[0]).toEqual({
      ...DEFAULT_ALERT_RULES,
      frost: { belowC: 1.1, holdMin: 2 },
      tooWarm: { enabled: true, aboveC: 35, holdMin: 10 },
      hysteresisK: 1,
    });
    expect(await screen.findByText(/Saved\. The controller uses these rules for Glasshouse/)).toBeTruthy();
  });

  it("sends null while the frost alert follows the house, and an untouched form as the defaults", async () => {
    renderForm();
    fireEvent.click(screen.getByRole("checkbox", { name: "Heater on for a long time: on" }));
    fireEvent.click(screen.getByRole("button", { name: "Save rules for Glasshouse" }));
    await waitFor(() => expect(sent).toHaveLength(1));
    expect(sent[0]).toEqual({ ...DEFAULT_ALERT_RULES, heaterLongOn: { enabled: false, afterHours: 12 } });
  });

  it("checks the converted value against the schema and sends nothing when it is out of bounds", async () => {
    renderForm();
    // 200 °F = 93.3 °C, above the 60 °C ceiling.
    type(/^Too warm above \(°F\)/, "200");
    fireEvent.click(screen.getByRole("button", { name: "Save rules for Glasshouse" }));
    expect(await screen.findByText("Too-warm temperature must be at most 60 °C (140 °F)")).toBeTruthy();
    expect(sent).toEqual([]);
  });

  it("fills in the defaults on reset, to be saved", async () => {
    renderForm(true, { ...DEFAULT_ALERT_RULES, tooWarm: { enabled: false, aboveC: 40, holdMin: 30 } });
    expect(valueOf(/^Too warm above \(°F\)/)).toBe("104");
    fireEvent.click(screen.getByRole("button", { name: "Reset to defaults" }));
    expect(valueOf(/^Too warm above \(°F\)/)).toBe("89.6");
    expect((screen.getByRole("checkbox", { name: "Too warm: on" }) as HTMLInputElement).checked).toBe(true);
    expect(sent).toEqual([]);
  });

  it("lets a helper read the rules but not change them", () => {
    renderForm(false);
    expect(screen.getByLabelText(/^Too warm above \(°F\)/).matches(":disabled")).toBe(true);
    expect(screen.queryByRole("button", { name: /Save rules/ })).toBeNull();
    expect(screen.getByText("Owners and growers change these rules; you can read them here.")).toBeTruthy();
  });

  it("keeps the heater caution beside the heater rule", () => {
    renderForm();
    expect(screen.getByText(/Heaters, damp and electricity/)).toBeTruthy();
  });
});
