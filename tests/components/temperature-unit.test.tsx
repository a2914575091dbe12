import { render, screen } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { Temperature, TemperatureUnitProvider } from "@/components/site/TemperatureUnit";

describe("Temperature", () => {
  it("shows a °C value in the person's unit", () => {
    render(
      <TemperatureUnitProvider unit="f">
        <p data-testid="t">
          <Temperature c={10} />
        </p>
      </TemperatureUnitProvider>,
    );
    // 10 °C = 50 °F (the Celsius–Fahrenheit relation, F = C × 9/5 + 32).
    expect(screen.getByTestId("t").textContent).toBe("50.0 °F");
  });

  it("is °C without a choice", () => {
    render(
      <p data-testid="c">
        <Temperature c={-3.25} />
      </p>,
    );
    expect(screen.getByTestId("c").textContent).toBe("-3.3 °C");
  });
});
