export default function Loading() {
  return (
    <div role="status" aria-busy="true" aria-label="Loading" className="animate-pulse space-y-4">
      <div className="h-8 w-64 rounded bg-paper-sunk" />
      <div className="h-4 w-96 max-w-full rounded bg-paper-sunk" />
      <div className="grid gap-4 md:grid-cols-2">
        <div className="h-40 rounded-card bg-paper-sunk" />
        <div className="h-40 rounded-card bg-paper-sunk" />
      </div>
    </div>
  );
}
