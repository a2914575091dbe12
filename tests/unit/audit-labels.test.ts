import { describe, expect, it } from "vitest";
import { auditSubject, decodeAuditCursor, formatAuditValue, describeAuditAction, describeAuditChanges, encodeAuditCursor, fieldLabel, localDayRange } from "@/lib/audit";
import { invitationMail, invitationState } from "@/lib/invitations";

describe("audit labels", () => {
  it("labels known actions, and spells out unknown ones from their entity and verb or shows them raw", () => {
    expect(describeAuditAction("member.role")).toBe("Changed a member's role");
    expect(describeAuditAction("plug.calibrate_meter")).toBe("Plug: calibrate meter");
    expect(describeAuditAction("gizmo.spin")).toBe("gizmo.spin");
  });

  it("lists short values with commas, and values that hold commas (windows in words) with semicolons", () => {
    expect(formatAuditValue(["mo", "tu"], "UTC")).toBe("mo, tu");
    expect(formatAuditValue(["Mon–Fri 06:00–21:00, 8–10 °C", "Sat 07:00–09:00, On"], "UTC")).toBe("Mon–Fri 06:00–21:00, 8–10 °C; Sat 07:00–09:00, On");
    expect(formatAuditValue([], "UTC")).toBe("none");
  });

  it("names fields with their units", () => {
    expect(fieldLabel("lowLimitC")).toBe("Low safety limit (°C)");
    expect(fieldLabel("minOnS")).toBe("Min on (s)");
    expect(fieldLabel("band.highC")).toBe("Band › High (°C)");
  });

  it("lists only the changed fields of an update, readable, in the site's zone", () => {
    const changes = describeAuditChanges(
      { name: "Long", role: "helper", expiresAt: "2026-03-14T18:00:00.000Z", updatedAt: "x" },
      { name: "Long", role: "grower", expiresAt: "2026-03-17T18:00:00.000Z", updatedAt: "y" },
      "Europe/London",
    );
    expect(changes).toEqual([
      { field: "role", label: "Role", before: "helper", after: "grower" },
      { field: "expiresAt", label: "Expires", before: "14 Mar 2026, 18:00", after: "17 Mar 2026, 18:00" },
    ]);
  });

  it("a partial change lists what was sent; creations and removals list what there was", () => {
    expect(describeAuditChanges({ name: "A", mainsVoltage: 230 }, { mainsVoltage: 240 }, "UTC")).toEqual([
      { field: "mainsVoltage", label: "Mains voltage (V)", before: "230", after: "240" },
    ]);
    expect(describeAuditChanges(null, { enabled: true, days: ["mo", "tu"] }, "UTC")).toEqual([
      { field: "enabled", label: "Enabled", before: null, after: "yes" },
      { field: "days", label: "Days", before: null, after: "mo, tu" },
    ]);
    expect(describeAuditChanges({ name: "Gone" }, null, "UTC")).toEqual([{ field: "name", label: "Name", before: "Gone", after: null }]);
  });

  it("names the thing by its name or e-mail, else its kind", () => {
    expect(auditSubject({ entityType: "member", before: null, after: { email: "a@b.example" } })).toBe("a@b.example");
    expect(auditSubject({ entityType: "house", before: { name: "Old" }, after: { name: "New" } })).toBe("New");
    expect(auditSubject({ entityType: "override", before: null, after: null })).toBe("Override");
  });

  it("turns local days into instants, across a clock change", () => {
    // Europe/London moved to BST (UTC+1) on 2026-03-29 (IANA tz database).
    const { start, end } = localDayRange({ from: "2026-03-29", to: "2026-03-29" }, "Europe/London");
    expect(start!.toISOString()).toBe("2026-03-29T00:00:00.000Z");
    expect(end!.toISOString()).toBe("2026-03-29T23:00:00.000Z");
  });

  it("round-trips the cursor and refuses others", () => {
    const cursor = { at: new Date("2026-01-01T00:00:00.123Z"), id: 42 };
    expect(decodeAuditCursor(encodeAuditCursor(cursor))).toEqual(cursor);
    expect(decodeAuditCursor("1_2_3")).toBeNull();
  });
});

describe("invitations", () => {
  const now = new Date("2026-03-01T12:00:00Z");
  const base = { acceptedAt: null, withdrawnAt: null, expiresAt: new Date("2026-03-02T12:00:00Z") };
  it("knows its state; used and withdrawn outrank expired", () => {
    expect(invitationState(base, now)).toBe("pending");
    expect(invitationState({ ...base, expiresAt: now }, now)).toBe("expired");
    expect(invitationState({ ...base, expiresAt: now, acceptedAt: now }, now)).toBe("accepted");
    expect(invitationState({ ...base, expiresAt: now, withdrawnAt: now }, now)).toBe("withdrawn");
  });

  it("writes an e-mail with who, site, role, link and expiry, and escapes the HTML", () => {
    const mail = invitationMail({
      siteName: "Bees & Beans",
      inviterName: "Ana <Owner>",
      roleName: "Helper",
      roleSummary: "Sees the state",
      link: "https://cloche.example/invitations/abc",
      expiresAt: new Date("2026-03-04T18:00:00Z"),
      timeZone: "Europe/London",
    });
    expect(mail.subject).toBe("Ana <Owner> invites you to Bees & Beans on Cloche");
    expect(mail.text).toContain("as Helper");
    expect(mail.text).toContain("https://cloche.example/invitations/abc");
    // 18:00 UTC on 4 March is 18:00 in London (GMT until 29 March 2026, IANA tz database).
    expect(mail.text).toContain("expires on Wednesday, 4 March 2026 at 18:00 (Europe/London)");
    expect(mail.html).toContain("Ana &lt;Owner&gt;");
    expect(mail.html).toContain("Bees &amp; Beans");
  });
});
