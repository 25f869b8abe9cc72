import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { getCurrentSession } from "@/lib/auth/session";
import { PATH_HEADER } from "@/lib/auth/guard";
import { isPublicPage } from "@/lib/auth/policy";
import { getShopSettings } from "@/db/queries/settings";
import { PublicFrame } from "@/components/shell/public-frame";
import { Shell } from "@/components/shell/shell";

export const dynamic = "force-dynamic";

export default async function ShopLayout({ children }: { children: React.ReactNode }) {
  const { user } = await getCurrentSession();
  if (!user) {
    // Someone signed out sees a public page (PAGE_POLICY) in a plain frame; every page's own guard
    // still decides, this only spares the menu.
    if (!isPublicPage((await headers()).get(PATH_HEADER))) redirect("/sign-in");
    const { shopName } = await getShopSettings();
    return <PublicFrame shopName={shopName}>{children}</PublicFrame>;
  }
  const settings = await getShopSettings();
  return (
    <Shell shopName={settings.shopName} user={user}>
      {children}
    </Shell>
  );
}
