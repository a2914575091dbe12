// What the houses overview says a plug is doing, from the log and the controller's latest decision.
import { describe, expect, it } from "vitest";
import { causeWords, presentCause } from "@/components/houses/live-format";

describe("presentCause", () => {
  it("is what now keeps the plug as it is, once its last switch is confirmed", () => {
    expect(presentCause({ cause: "failsafe", heldBy: "schedule", acknowledged: true })).toBe("schedule");
  });
  it("is the switch on its way while the plug has not confirmed it", () => {
    expect(presentCause({ cause: "override", heldBy: "schedule", acknowledged: false })).toBe("override");
  });
  it("falls back to the last switch's cause when the controller has said nothing yet", () => {
    expect(presentCause({ cause: "default", heldBy: null, acknowledged: true })).toBe("default");
    expect(presentCause({ cause: null, heldBy: null, acknowledged: null })).toBeNull();
  });
  it("reads in the grower's words", () => {
    expect(causeWords({ cause: presentCause({ cause: "failsafe", heldBy: "default", acknowledged: true }) })).toBe("Outside time windows");
  });
});
