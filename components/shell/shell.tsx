import Link from "next/link";
import type { ReactNode } from "react";
import { Wordmark } from "@/components/brand/logo";
import { NavLinks } from "./nav-links";
import { navFor } from "@/lib/nav";
import { ROLE_LABELS, type Role } from "@/lib/roles";
import { signOutAction } from "@/app/(auth)/actions";

interface ShellProps {
  shopName: string;
  user: { name: string; roles: Role[]; mustChangePassword: boolean };
  children: ReactNode;
}

/** The frame around every signed-in page: top bar, role navigation, and the page itself. */
export function Shell({ shopName, user, children }: ShellProps) {
  return (
    <div className="min-h-screen lg:grid lg:grid-cols-[15rem_1fr]">
      <a href="#main" className="skip-link no-print">
        Skip to content
      </a>
      <aside className="no-print border-b border-bead bg-paper-raised lg:min-h-screen lg:border-b-0 lg:border-r">
        <div className="flex items-center justify-between gap-3 px-4 py-3 lg:block lg:px-5 lg:py-5">
          <Link href="/" className="no-underline hover:no-underline" aria-label="Blockyard home">
            <Wordmark />
          </Link>
          <p className="truncate text-xs text-ink-faint lg:mt-1">{shopName}</p>
        </div>
        <nav aria-label="Main" className="px-3 pb-2 lg:px-3">
          <NavLinks items={navFor(user.roles)} />
        </nav>
        <div className="hidden border-t border-bead px-5 py-4 lg:block">
          <UserBox user={user} />
        </div>
      </aside>
      <div className="min-w-0">
        <div className="no-print flex items-center justify-end gap-3 border-b border-bead px-4 py-2 lg:hidden">
          <UserBox user={user} compact />
        </div>
        {user.mustChangePassword && (
          <div className="no-print border-b border-wire bg-wire-light px-6 py-2 text-sm">
            You are using a temporary password. <Link href="/account">Choose your own now.</Link>
          </div>
        )}
        <main id="main" tabIndex={-1} className="mx-auto max-w-6xl px-4 py-6 focus:outline-none sm:px-6 lg:px-8">
          {children}
        </main>
      </div>
    </div>
  );
}

function UserBox({ user, compact = false }: { user: ShellProps["user"]; compact?: boolean }) {
  return (
    <div className={compact ? "flex items-center gap-3" : "space-y-2"}>
      <div className="min-w-0">
        <p className="truncate text-sm font-medium">{user.name}</p>
        <p className="truncate text-xs text-ink-faint">{user.roles.map((r) => ROLE_LABELS[r]).join(", ")}</p>
      </div>
      <div className="flex items-center gap-1 text-sm">
        <Link href="/account" className="flex min-h-11 items-center rounded-md px-3 font-medium hover:bg-paper-sunk">
          Account
        </Link>
        <form action={signOutAction}>
          <button
            type="submit"
            className="min-h-11 rounded-md px-3 text-sm font-medium text-ink-soft hover:bg-paper-sunk hover:text-ink"
          >
            Sign out
          </button>
        </form>
      </div>
    </div>
  );
}
