import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { userSettings } from "@/db/schema";
import type { TemperatureUnit } from "@/lib/domain";

export type UserSettings = { temperatureUnit: TemperatureUnit };

const defaults: UserSettings = { temperatureUnit: "c" };

/** A person's own settings; the defaults until they choose. */
export async function getUserSettings({ userId }: { userId: string }): Promise<UserSettings> {
  const [row] = await getDb()
    .select({ temperatureUnit: userSettings.temperatureUnit })
    .from(userSettings)
    .where(eq(userSettings.userId, userId))
    .limit(1);
  return row ?? defaults;
}

/** Stores a person's own settings (one row each, made on first save). */
export async function setUserSettings({ userId, settings }: { userId: string; settings: UserSettings }): Promise<UserSettings> {
  await getDb()
    .insert(userSettings)
    .values({ userId, ...settings })
    .onDuplicateKeyUpdate({ set: { temperatureUnit: settings.temperatureUnit, updatedAt: new Date() } });
  return getUserSettings({ userId });
}
