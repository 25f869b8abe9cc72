import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { getCurrentSession } from "@/lib/auth/session";
import { SignInForm } from "@/components/auth/sign-in-form";
import { LogoMark } from "@/components/brand/logo";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage() {
  const { user } = await getCurrentSession();
  if (user) redirect("/");
  return (
    <main className="flex min-h-screen items-center justify-center bg-paper-sunk p-4">
      <div className="w-full max-w-md rounded-card border border-bead bg-paper-raised p-8 shadow-card">
        <div className="mb-6 flex items-center gap-3">
          <LogoMark size={48} />
          <div>
            <p className="text-xl font-bold tracking-tight">
              Block<span className="text-kerf">yard</span>
            </p>
            <p className="text-sm text-ink-soft">Foam stock and cut planning</p>
          </div>
        </div>
        <h1 className="mb-4 text-xl">Sign in</h1>
        <SignInForm />
        <p className="mt-6 text-xs text-ink-faint">
          Forgotten your password? Ask your shop&apos;s admin to set a temporary one.
        </p>
      </div>
    </main>
  );
}
