import "server-only";
import { getShopSettings } from "@/db/queries/settings";
import type { CurrentUser } from "@/lib/auth/session";
import type { LengthUnit } from "@/lib/units";

/** The unit this person sees lengths in: their own choice, else the shop's. */
export async function displayUnit(user: CurrentUser): Promise<LengthUnit> {
  return user.displayUnits ?? (await getShopSettings()).displayUnits;
}
