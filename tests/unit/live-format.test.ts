// What the houses overview says a plug is doing, from the log and the controller's latest decision.
import { describe, expect, it } from "vitest";
import { causeWords, presentCause } from "@/components/houses/live-format";

describe("presentCause", () => {
  it("is what now keeps the plug as it is, once its last switch is confirmed", () => {
    expect(presentCause({ cause: "failsafe", presentCause: "schedule", acknowledged: true })).toBe("schedule");
  });
  it("is the switch on its way while the plug has not confirmed it", () => {
    expect(presentCause({ cause: "override", presentCause: "schedule", acknowledged: false })).toBe("override");
  });
  it("falls back to the last switch's cause when the controller has said nothing yet", () => {
    expect(presentCause({ cause: "default", presentCause: null, acknowledged: true })).toBe("default");
    expect(presentCause({ cause: null, presentCause: null, acknowledged: null })).toBeNull();
  });
  it("reads in the grower's words", () => {
    expect(causeWords({ cause: presentCause({ cause: "failsafe", presentCause: "default", acknowledged: true }) })).toBe("Outside time windows");
  });
});
