// The schemas of setting up a site: the rules tying fields together and the load rule.
import { describe, expect, it } from "vitest";
import { changedHouseSchema, houseSchema } from "@/lib/schemas/house";
import { plugChangeSchema, plugFormValues, plugRules, plugSchema, plugSchemaFor } from "@/lib/schemas/plug";
import { sensorChangeSchema, sensorSchema } from "@/lib/schemas/sensor";
import { userSettingsSchema } from "@/lib/schemas/me";
import { changedFields } from "@/lib/changed-fields";

const house = { name: "Lean-to", kind: "glasshouse", lengthM: 4, widthM: 2, eaveHeightM: 2, ridgeHeightM: 2.5, glazing: "single_glass" };
const plug = {
  name: "Heater",
  deviceId: "lean-to-heater",
  houseId: "7d0f7a52-5a1b-4f0e-9c39-0b7f7f7f7f7f",
  applianceKind: "heater",
  applianceWatts: 2000,
  ratedCurrentA: 13,
};
const uk = { mainsVoltage: 230, continuousLoadPercent: 80 };

describe("house limits", () => {
  it("defaults the frost limit to 2 °C and the cut-out to 35 °C", () => {
    expect(houseSchema.parse(house)).toMatchObject({ lowLimitC: 2, highLimitC: 35 });
  });

  it("refuses a low limit not below the high limit, on lowLimitC", () => {
    const result = houseSchema.safeParse({ ...house, lowLimitC: 25, highLimitC: 25 });
    expect(result.error?.issues.map((i) => i.path.join("."))).toEqual(["lowLimitC"]);
    expect(changedHouseSchema.safeParse({ ridgeHeightM: 3, eaveHeightM: 2, lowLimitC: 10, highLimitC: 9 }).success).toBe(false);
  });

  it("tells the bounds in °C and °F", () => {
    // -20 °C = -4 °F and 60 °C = 140 °F (F = C × 9/5 + 32).
    expect(houseSchema.safeParse({ ...house, lowLimitC: -25 }).error?.issues[0]?.message).toBe("Low limit must be at least -20 °C (-4 °F)");
    expect(houseSchema.safeParse({ ...house, highLimitC: 61 }).error?.issues[0]?.message).toBe("High limit must be at most 60 °C (140 °F)");
  });
});

describe("plug", () => {
  it("fills the usual settings", () => {
    expect(plugSchema.parse(plug)).toMatchObject({ failsafe: "off", sensorId: null, minOnS: 180, minOffS: 180, leaseS: 900, staleAfterS: 600, metersEnergy: false });
  });

  it.each([
    ["UPPER", false],
    ["a", true],
    ["-lead", false],
    ["trail-", false],
    ["x".repeat(65), false],
    ["ok-123", true],
  ])("device id %s → %s", (deviceId, ok) => {
    expect(plugSchema.safeParse({ ...plug, deviceId }).success).toBe(ok);
    expect(sensorSchema.safeParse({ name: "Air", deviceId, houseId: plug.houseId }).success).toBe(ok);
  });

  it("wants the duty percent with a duty-cycle fail-safe", () => {
    expect(plugSchema.safeParse({ ...plug, failsafe: "duty" }).error?.issues[0]?.path).toEqual(["failsafeDutyPercent"]);
    expect(plugSchema.safeParse({ ...plug, failsafe: "duty", failsafeDutyPercent: 30 }).success).toBe(true);
  });

  it("refuses a rating in hundredths but takes tenths", () => {
    expect(plugSchema.safeParse({ ...plug, ratedCurrentA: 12.55 }).success).toBe(false);
    expect(plugSchema.safeParse({ ...plug, ratedCurrentA: 10.3 }).success).toBe(true);
  });

  it("applies the continuous-load rule with the site's voltage and margin", () => {
    // 2392 W / 230 V = 10.4 A = 80 % of 13 A: at the limit is within it; one watt more is not.
    // The 80 % margin for continuous loads: NEC 210.19(A)/210.20(A).
    expect(plugRules(uk).safeParse({ ...plugSchema.parse({ ...plug, applianceWatts: 2392 }) }).success).toBe(true);
    const over = plugRules(uk).safeParse(plugSchema.parse({ ...plug, applianceWatts: 2393 }));
    expect(over.error?.issues[0]?.path).toEqual(["applianceWatts"]);
    // The same 2000 W heater on a 120 V, 15 A North American plug draws 16.7 A: over its rating.
    expect(plugSchemaFor({ mainsVoltage: 120, continuousLoadPercent: 80 }).safeParse({ ...plug, ratedCurrentA: 15 }).success).toBe(false);
    expect(plugSchemaFor(uk).safeParse(plug).success).toBe(true);
  });

  it("keeps the device id out of a change, and the schedule's default out of the form", () => {
    expect(plugChangeSchema.safeParse({ deviceId: "new-id" }).success).toBe(false);
    expect(sensorChangeSchema.safeParse({ deviceId: "new-id" }).success).toBe(false);
    expect(plugChangeSchema.safeParse({ outsideWindows: "frost" }).success).toBe(false);
    const stored = { ...plugSchema.parse(plug), id: "p1", outsideWindows: "frost", frostLowC: 3, siteId: "s" };
    expect(plugFormValues(stored)).not.toHaveProperty("outsideWindows");
    expect(plugFormValues(stored)).toMatchObject({ id: "p1", deviceId: "lean-to-heater" });
  });
});

it("a person's unit is c or f", () => {
  expect(userSettingsSchema.safeParse({ temperatureUnit: "f" }).success).toBe(true);
  expect(userSettingsSchema.safeParse({ temperatureUnit: "K" }).success).toBe(false);
});

describe("changedFields", () => {
  it("keeps only what differs, with the stored values it replaces", () => {
    const stored = { name: "Heater", watts: 2000, sensorId: null as string | null, notes: null as string | null };
    expect(changedFields(stored, { name: "Heater", watts: 1500, sensorId: null })).toEqual({ before: { watts: 2000 }, after: { watts: 1500 } });
    expect(changedFields(stored, { sensorId: "s1", notes: undefined })).toEqual({ before: { sensorId: null }, after: { sensorId: "s1" } });
    expect(changedFields(stored, {})).toEqual({ before: {}, after: {} });
  });
});
