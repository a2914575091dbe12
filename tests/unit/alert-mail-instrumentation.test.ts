// The web app's start hook: it starts the notifier only in the Node.js runtime, not when
// CLOCHE_NOTIFIER=off, and a failure to start is logged, never thrown (a throw there
// would break every request).
import { afterEach, describe, expect, it, vi } from "vitest";
import { register } from "@/instrumentation";

const saved = { ...process.env };

afterEach(() => {
  process.env = { ...saved };
  vi.restoreAllMocks();
});

describe("instrumentation register()", () => {
  it("does nothing outside the Node.js runtime", async () => {
    process.env.NEXT_RUNTIME = "edge";
    const error = vi.spyOn(console, "error").mockImplementation(() => undefined);
    const log = vi.spyOn(console, "log").mockImplementation(() => undefined);
    await expect(register()).resolves.toBeUndefined();
    expect(error).not.toHaveBeenCalled();
    expect(log).not.toHaveBeenCalled();
  });

  it("leaves the notifier off when CLOCHE_NOTIFIER=off, and says so", async () => {
    process.env.NEXT_RUNTIME = "nodejs";
    process.env.CLOCHE_NOTIFIER = "off";
    const log = vi.spyOn(console, "log").mockImplementation(() => undefined);
    await register();
    expect(log).toHaveBeenCalledWith(expect.stringContaining("CLOCHE_NOTIFIER=off"));
  });

  it("logs a notifier that cannot start and carries on", async () => {
    process.env.NEXT_RUNTIME = "nodejs";
    delete process.env.CLOCHE_NOTIFIER;
    delete process.env.DATABASE_URL;
    const error = vi.spyOn(console, "error").mockImplementation(() => undefined);
    await expect(register()).resolves.toBeUndefined();
    expect(error).toHaveBeenCalledWith(expect.stringContaining("could not start"), expect.stringContaining("DATABASE_URL"));
  });
});
