import Link from "next/link";

export default function BlockNotFound() {
  return (
    <div className="mx-auto max-w-lg py-16 text-center">
      <h1>No block with that code</h1>
      <p className="mt-2 text-ink-soft">Check the label again, or search the stock list by the first few characters.</p>
      <Link href="/stock" className="mt-4 inline-block font-medium">
        Back to stock
      </Link>
    </div>
  );
}
