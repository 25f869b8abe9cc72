import { api, readJson } from "@/lib/auth/guard";
import { getShopSettings, saveShopSettings } from "@/db/queries/settings";
import { shopSettingsSchema } from "@/lib/validations/settings";

export const GET = api("GET /api/settings", async () => ({ settings: await getShopSettings() }));

export const PUT = api("PUT /api/settings", async ({ req, user }) => {
  const settings = await readJson(req, shopSettingsSchema);
  await saveShopSettings(settings, user.id);
  return { settings: await getShopSettings() };
});
