import type { Metadata } from "next";
import { requirePage } from "@/lib/auth/guard";
import { getShopSettings } from "@/db/queries/settings";
import { PageHeader } from "@/components/ui/card";
import { SettingsForm } from "@/components/admin/settings-form";

export const metadata: Metadata = { title: "Shop settings" };

export default async function SettingsPage() {
  await requirePage("/admin/settings");
  const settings = await getShopSettings();
  return (
    <>
      <PageHeader title="Shop settings" lead="Units and the cutting defaults every nesting run starts from." />
      <SettingsForm initial={settings} />
    </>
  );
}
