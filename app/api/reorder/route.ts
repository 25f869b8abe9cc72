import { api } from "@/lib/auth/guard";
import { getReorderSettings, listReorder } from "@/db/queries/reorder";

/** Every grade's reorder figures with their inputs; `due` marks those at or under the point. */
export const GET = api("GET /api/reorder", async () => {
  const [items, settings] = await Promise.all([listReorder(), getReorderSettings()]);
  return { items, settings, due: items.filter((r) => r.result.due).length };
});
