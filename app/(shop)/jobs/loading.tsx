export default function Loading() {
  return (
    <div role="status" aria-busy="true" aria-label="Loading jobs" className="animate-pulse space-y-4">
      <div className="h-8 w-40 rounded bg-paper-sunk" />
      <div className="h-10 rounded-card bg-paper-sunk" />
      <div className="h-96 rounded-card bg-paper-sunk" />
    </div>
  );
}
