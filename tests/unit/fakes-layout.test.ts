import { mkdtemp, rm, writeFile } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { readDeviceSecrets } from "@/fakes/layout";

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), "cloche-fakes-"));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe("device secrets file", () => {
  it("reads user name → secret", async () => {
    const file = path.join(dir, "ok.json");
    await writeFile(file, JSON.stringify({ "fernhollow:plug:glass-heater": "s3cret" }));
    expect(await readDeviceSecrets(file)).toEqual({ "fernhollow:plug:glass-heater": "s3cret" });
  });

  it("says what is wrong with a missing, broken or misshapen file", async () => {
    await expect(readDeviceSecrets(path.join(dir, "absent.json"))).rejects.toThrow(/cannot read the device secrets/);
    const broken = path.join(dir, "broken.json");
    await writeFile(broken, "{ nope");
    await expect(readDeviceSecrets(broken)).rejects.toThrow(/not JSON/);
    const wrong = path.join(dir, "wrong.json");
    await writeFile(wrong, JSON.stringify({ a: 1 }));
    await expect(readDeviceSecrets(wrong)).rejects.toThrow(/user name → secret/);
  });
});
