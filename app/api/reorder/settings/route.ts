import { api, readJson } from "@/lib/auth/guard";
import { saveReorderSettings } from "@/db/queries/reorder";
import { reorderSettingsSchema } from "@/lib/validations/purchasing";

export const PUT = api("PUT /api/reorder/settings", async ({ req, user }) => {
  const input = await readJson(req, reorderSettingsSchema);
  return { settings: await saveReorderSettings(input, user.id) };
});
