import "server-only";
import { cache } from "react";
import { db } from "@/db";
import type { ShopSettings } from "@/lib/validations/settings";

export const FALLBACK_SETTINGS: ShopSettings = {
  shopName: "Blockyard",
  displayUnits: "mm",
  kerf: 1.5,
  trim: 6,
  defectMargin: 10,
  minOffcut: [150, 150, 25],
  layout: "guillotine",
  feedMmPerMin: 300,
  nestingTimeLimitMs: 3000,
};

/** The shop's settings, read once per page render (layout and page share it; React cache). */
export const getShopSettings = cache(async function getShopSettings(): Promise<ShopSettings> {
  const r = await db()("shop_settings").where({ id: 1 }).first();
  if (!r) return FALLBACK_SETTINGS;
  return {
    shopName: r.shop_name,
    displayUnits: r.display_units,
    kerf: Number(r.kerf_mm),
    trim: Number(r.trim_mm),
    defectMargin: Number(r.defect_margin_mm),
    minOffcut: [Number(r.min_offcut_x_mm), Number(r.min_offcut_y_mm), Number(r.min_offcut_z_mm)],
    layout: r.layout,
    feedMmPerMin: Number(r.feed_mm_per_min),
    nestingTimeLimitMs: r.nesting_time_limit_ms,
  };
});

export async function saveShopSettings(s: ShopSettings, actorId: string): Promise<void> {
  const row = {
    id: 1,
    shop_name: s.shopName,
    display_units: s.displayUnits,
    kerf_mm: s.kerf,
    trim_mm: s.trim,
    defect_margin_mm: s.defectMargin,
    min_offcut_x_mm: s.minOffcut[0],
    min_offcut_y_mm: s.minOffcut[1],
    min_offcut_z_mm: s.minOffcut[2],
    layout: s.layout,
    feed_mm_per_min: s.feedMmPerMin,
    nesting_time_limit_ms: s.nestingTimeLimitMs,
    updated_by: actorId,
  };
  await db().transaction(async (trx) => {
    await trx("shop_settings")
      .insert({ ...row, updated_at: trx.fn.now() })
      .onConflict("id")
      .merge();
    await trx("audit_log").insert({ actor_id: actorId, action: "settings.update", subject: "shop", detail: s });
  });
}

export async function pingDatabase(): Promise<boolean> {
  try {
    await db().raw("select 1");
    return true;
  } catch {
    return false;
  }
}
