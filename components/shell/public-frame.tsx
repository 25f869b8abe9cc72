import Link from "next/link";
import type { ReactNode } from "react";
import { Wordmark } from "@/components/brand/logo";

/** The frame around a public page (PAGE_POLICY "public") for someone signed out: no menu, a way to sign in. */
export function PublicFrame({ shopName, children }: { shopName: string; children: ReactNode }) {
  return (
    <div className="min-h-screen">
      <a href="#main" className="skip-link no-print">
        Skip to content
      </a>
      <header className="no-print flex items-center justify-between gap-3 border-b border-bead bg-paper-raised px-4 py-3 sm:px-6">
        <div className="flex min-w-0 items-center gap-3">
          <Wordmark />
          <p className="truncate text-xs text-ink-faint">{shopName}</p>
        </div>
        <Link href="/sign-in" className="flex min-h-11 items-center rounded-md px-3 font-medium hover:bg-paper-sunk">
          Sign in
        </Link>
      </header>
      <main id="main" tabIndex={-1} className="mx-auto max-w-6xl px-4 py-6 focus:outline-none sm:px-6 lg:px-8">
        {children}
      </main>
    </div>
  );
}
