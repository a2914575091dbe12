import { describe, expect, it } from "vitest";
import { currency, timeZone } from "@/lib/schemas/common";
import { houseChangeSchema, houseSchema } from "@/lib/schemas/house";
import { signUpSchema } from "@/lib/schemas/account";

describe("time zone", () => {
  // Zone names from the IANA time-zone database, as Node's Intl (ICU) knows them.
  it.each(["Europe/London", "Australia/Sydney", "America/Argentina/Buenos_Aires", "Pacific/Auckland", "UTC"])(
    "accepts the IANA zone %s",
    (zone) => expect(timeZone.safeParse(zone).success).toBe(true),
  );

  it.each(["Mars/Olympus_Mons", "+01:00", "GMT+1", "", "Europe/London; DROP"])("refuses %j", (zone) => {
    expect(timeZone.safeParse(zone).success).toBe(false);
  });
});

describe("currency", () => {
  // ISO 4217 codes, as Intl.supportedValuesOf("currency") lists them.
  it("accepts ISO 4217 codes in either case", () => {
    expect(currency.parse("gbp")).toBe("GBP");
    expect(currency.parse("NZD")).toBe("NZD");
  });
  it("refuses made-up codes", () => {
    expect(currency.safeParse("XXY").success).toBe(false);
    expect(currency.safeParse("POUNDS").success).toBe(false);
  });
});

describe("house", () => {
  const valid = {
    name: "Lean-to",
    kind: "glasshouse",
    lengthM: 4,
    widthM: 2.5,
    eaveHeightM: 2,
    ridgeHeightM: 2.6,
    glazing: "single_glass",
  };

  it("fills in the air changes and the high limit of a new house", () => {
    expect(houseSchema.parse(valid)).toMatchObject({ airChangesPerHour: 1, highLimitC: 35 });
  });

  it("does not reset fields a change leaves out", () => {
    expect(houseChangeSchema.parse({ name: "Renamed" })).toEqual({ name: "Renamed" });
  });

  it("refuses numbers sent as text or booleans", () => {
    expect(houseSchema.safeParse({ ...valid, lengthM: "4" }).success).toBe(false);
    expect(houseChangeSchema.safeParse({ highLimitC: true }).success).toBe(false);
  });
});

describe("sign-up", () => {
  it("normalises the email and asks for a long enough password", () => {
    const parsed = signUpSchema.parse({
      name: " Ada ",
      email: " Ada@Example.TEST ",
      password: "long-enough-pw",
      siteName: "Plot",
      timeZone: "Europe/London",
      currency: "GBP",
    });
    expect(parsed.email).toBe("ada@example.test");
    expect(parsed.name).toBe("Ada");
    const short = signUpSchema.safeParse({ ...parsed, password: "short" });
    expect(short.success).toBe(false);
    expect(short.error?.issues[0]?.path).toEqual(["password"]);
  });
});
