export default function RevisionLoading() {
  return (
    <div aria-busy="true" aria-label="Loading revision" className="animate-pulse space-y-4">
      <div className="h-7 w-48 rounded bg-raised" />
      <div className="h-48 rounded-lg bg-raised" />
    </div>
  );
}
