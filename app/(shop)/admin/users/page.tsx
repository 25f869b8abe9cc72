import type { Metadata } from "next";
import { requirePage } from "@/lib/auth/guard";
import { listUsers } from "@/db/queries/users";
import { PageHeader } from "@/components/ui/card";
import { People } from "@/components/admin/people";

export const metadata: Metadata = { title: "People" };

export default async function PeoplePage() {
  const me = await requirePage("/admin/users");
  const users = await listUsers();
  return (
    <>
      <PageHeader
        title="People"
        lead="Who can sign in, and which roles they hold. Deactivating someone signs them out everywhere at once."
      />
      <People initial={users} selfId={me.id} />
    </>
  );
}
