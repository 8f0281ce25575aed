export default function Loading() {
  return (
    <div aria-busy="true" aria-label="Loading" className="animate-pulse space-y-4">
      <div className="h-7 w-64 rounded bg-raised" />
      <div className="h-40 rounded-lg bg-raised" />
      <div className="h-24 rounded-lg bg-raised" />
    </div>
  );
}
