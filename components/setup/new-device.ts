import "server-only";
import { getHousesBySite } from "@/db/queries/houses";
import { getSensorsBySite } from "@/db/queries/sensors";

/** What a device form offers: the site's houses and working sensors, and the house asked for when it is one of them. */
export async function deviceFormOptions(siteId: string, houseParam: string | string[] | undefined) {
  const [houses, sensors] = await Promise.all([getHousesBySite({ siteId }), getSensorsBySite({ siteId })]);
  const houseId = typeof houseParam === "string" && houses.some((h) => h.id === houseParam) ? houseParam : undefined;
  return { houses: houses.map(({ id, name }) => ({ id, name })), sensors, houseId };
}
