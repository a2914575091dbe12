import { afterAll } from "vitest";
import { closeDb } from "@/db/client";

if (!process.env.DATABASE_URL) {
  throw new Error("Integration tests need DATABASE_URL: run them with `npm test`, which starts their MariaDB.");
}

afterAll(async () => {
  await closeDb();
});
