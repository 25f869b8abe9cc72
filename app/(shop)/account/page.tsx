import type { Metadata } from "next";
import { requirePage } from "@/lib/auth/guard";
import { Card, PageHeader } from "@/components/ui/card";
import { PasswordForm } from "@/components/auth/password-form";
import { ROLE_LABELS } from "@/lib/roles";

export const metadata: Metadata = { title: "Account" };

export default async function AccountPage() {
  const user = await requirePage("/account");
  return (
    <>
      <PageHeader title="Your account" lead={`${user.email} · ${user.roles.map((r) => ROLE_LABELS[r]).join(", ")}`} />
      <Card title="Change your password">
        <PasswordForm />
      </Card>
    </>
  );
}
