import Link from "next/link";
import { LogoMark } from "@/components/brand/logo";
import { buttonClass } from "@/components/ui/button";

export default function NotFound() {
  return (
    <main className="mx-auto flex min-h-[70vh] max-w-lg flex-col items-center justify-center gap-4 p-8 text-center">
      <LogoMark size={56} />
      <h1>Nothing on this shelf</h1>
      <p className="text-ink-soft">
        The page you asked for is not here. It may have been moved, or the link was cut short.
      </p>
      <search>
        <form action="/stock" method="get" className="flex flex-wrap justify-center gap-2">
          <input type="hidden" name="status" value="all" />
          <label htmlFor="lost-q" className="w-full text-sm text-ink-soft">
            Looking for a block? Its code (HF-10…) or the number on its label (1047):
          </label>
          <input
            id="lost-q"
            name="q"
            type="search"
            required
            maxLength={60}
            placeholder="HF-10 or 1047"
            className="min-h-11 w-48 rounded-md border border-bead-strong bg-paper-raised px-3"
          />
          <button type="submit" className={buttonClass("secondary")}>
            Search stock
          </button>
        </form>
      </search>
      <Link href="/" className="font-medium">
        Back to today&apos;s work
      </Link>
    </main>
  );
}
