import Link from "next/link";
import { buttonClass } from "@/components/ui/button";

/** A plain GET form, so the search works before (and without) the page's scripts. */
export default function BlockNotFound() {
  return (
    <div className="mx-auto max-w-lg py-16 text-center">
      <h1>No block with that code</h1>
      <p className="mt-2 text-ink-soft">
        Check the label again, or search the whole stock list by the start of the code (HF-10) or the number on the
        label (1047).
      </p>
      <search>
        <form action="/stock" method="get" className="mt-4 flex justify-center gap-2">
          <input type="hidden" name="status" value="all" />
          <label htmlFor="not-found-q" className="sr-only">
            Code or number
          </label>
          <input
            id="not-found-q"
            name="q"
            type="search"
            required
            maxLength={60}
            placeholder="HF-10 or 1047"
            className="min-h-11 w-48 rounded-md border border-bead-strong bg-paper-raised px-3"
          />
          <button type="submit" className={buttonClass("primary")}>
            Search stock
          </button>
        </form>
      </search>
      <Link href="/stock" className="mt-4 inline-block font-medium">
        Back to stock
      </Link>
    </div>
  );
}
