export default function Loading() {
  return (
    <div className="space-y-4" aria-busy="true" aria-label="Loading the preview">
      <div className="h-8 w-56 animate-pulse rounded bg-line" />
      <div className="h-24 animate-pulse rounded-card bg-surface" />
      <div className="h-64 animate-pulse rounded-card bg-surface" />
    </div>
  );
}
