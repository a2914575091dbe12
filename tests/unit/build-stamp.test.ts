import { describe, expect, it } from "vitest";
import { buildInputs, resolveImport } from "@/scripts/build-stamp";

describe("build stamp", () => {
  const inputs = buildInputs();

  it("covers the app, its config and the db modules the pages import", () => {
    for (const file of ["app/layout.tsx", "app/globals.css", "proxy.ts", "next.config.ts", "package-lock.json", "db/client.ts", "db/queries/live.ts", "db/schema/index.ts"]) {
      expect(inputs).toContain(file);
    }
  });

  it("leaves out the runners, the controller, the simulated devices, the seed and the tests", () => {
    const outside = inputs.filter((file) => /^(scripts|controller|fakes|tests)\//.test(file) || file === "db/seed.ts" || file === "db/migrate.ts");
    expect(outside).toEqual([]);
  });

  it("resolves @/ and relative imports to project files and leaves packages alone", () => {
    expect(resolveImport("app/api/health/route.ts", "@/db/client")).toBe("db/client.ts");
    expect(resolveImport("db/queries/live.ts", "../schema")).toBe("db/schema/index.ts");
    expect(resolveImport("db/queries/live.ts", "drizzle-orm")).toBeUndefined();
  });
});
