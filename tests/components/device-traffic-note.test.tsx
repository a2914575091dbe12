import { cleanup, render, screen } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import { DeviceRow, type DeviceRowData } from "@/components/setup/DeviceRow";

afterEach(cleanup);

const now = new Date("2026-03-02T14:30:00Z");
const sensor: DeviceRowData = { id: "s1", kind: "sensor", deviceId: "air-1", name: "North bench", online: true, lastSeenAt: now, retiredAt: null };

function row(device: DeviceRowData) {
  return render(
    <ul>
      <DeviceRow device={device} slug="fernhollow" now={now} timeZone="Europe/London" />
    </ul>,
  );
}

describe("a device's row on the devices page", () => {
  it("says nothing about traffic for a device that was never limited", () => {
    row(sensor);
    expect(screen.queryByText(/Sending too much/)).toBeNull();
    row({ ...sensor, id: "s2", traffic: { slowed: 0, oversized: 0, disconnected: 0, lastAt: null } });
    expect(screen.queryByText(/Sending too much/)).toBeNull();
  });

  it("says what the limits did, when, and what to look for", () => {
    row({ ...sensor, traffic: { slowed: 12, oversized: 0, disconnected: 2, lastAt: new Date("2026-03-02T14:02:00Z") } });
    const note = screen.getByText(/Sending too much/);
    expect(note.textContent).toBe("Sending too much: held back 12 times and cut off twice, last 28 minutes ago.");
    expect(note.querySelector("time")?.getAttribute("title")).toContain("14:02");
    expect(screen.getByText(/faulty device or firmware/)).toBeTruthy();
  });

  it("leaves it off a retired device", () => {
    row({ ...sensor, retiredAt: now, traffic: { slowed: 1, oversized: 0, disconnected: 0, lastAt: now } });
    expect(screen.queryByText(/Sending too much/)).toBeNull();
  });
});
