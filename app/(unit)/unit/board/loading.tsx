export default function Loading() {
  return (
    <div className="space-y-4" aria-busy="true" aria-label="Loading the unit board">
      <div className="h-8 w-48 animate-pulse rounded bg-line" />
      <div className="grid grid-cols-2 gap-3 md:grid-cols-5">
        {Array.from({ length: 10 }, (_, i) => (
          <div key={i} className="h-32 animate-pulse rounded-card bg-surface" />
        ))}
      </div>
    </div>
  );
}
