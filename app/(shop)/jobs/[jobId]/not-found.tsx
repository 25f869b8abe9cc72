import Link from "next/link";

export default function JobNotFound() {
  return (
    <div className="mx-auto max-w-lg py-16 text-center">
      <h1>No such job</h1>
      <p className="mt-2 text-ink-soft">
        It may have been a typo in the address. Every job is on the jobs list, including finished and called-off ones.
      </p>
      <Link href="/jobs?status=all" className="mt-4 inline-block font-medium">
        All jobs
      </Link>
    </div>
  );
}
