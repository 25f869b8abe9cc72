import Link from "next/link";
import { LogoMark } from "@/components/brand/logo";

export default function NotFound() {
  return (
    <main className="mx-auto flex min-h-[70vh] max-w-lg flex-col items-center justify-center gap-4 p-8 text-center">
      <LogoMark size={56} />
      <h1>Nothing on this shelf</h1>
      <p className="text-ink-soft">
        The page you asked for is not here. It may have been moved, or the link was cut short.
      </p>
      <Link href="/" className="font-medium">
        Back to today&apos;s work
      </Link>
    </main>
  );
}
