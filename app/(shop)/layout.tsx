import { redirect } from "next/navigation";
import { getCurrentSession } from "@/lib/auth/session";
import { getShopSettings } from "@/db/queries/settings";
import { Shell } from "@/components/shell/shell";

export const dynamic = "force-dynamic";

export default async function ShopLayout({ children }: { children: React.ReactNode }) {
  const { user } = await getCurrentSession();
  if (!user) redirect("/sign-in");
  const settings = await getShopSettings();
  return (
    <Shell shopName={settings.shopName} user={user}>
      {children}
    </Shell>
  );
}
