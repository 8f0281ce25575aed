export default function CompareLoading() {
  return (
    <div aria-busy="true" aria-label="Loading comparison" className="animate-pulse space-y-4">
      <div className="h-7 w-64 rounded bg-raised" />
      <div className="h-20 rounded-lg bg-raised" />
      <div className="h-72 rounded-lg bg-raised" />
    </div>
  );
}
