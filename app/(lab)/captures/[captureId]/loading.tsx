export default function CaptureLoading() {
  return (
    <div aria-busy="true" aria-label="Loading capture set" className="animate-pulse space-y-4">
      <div className="h-7 w-72 rounded bg-raised" />
      <div className="grid gap-4 xl:grid-cols-[minmax(0,1fr)_22rem]">
        <div className="h-48 rounded-lg bg-raised" />
        <div className="h-48 rounded-lg bg-raised" />
      </div>
      <div className="h-96 rounded-lg bg-raised" />
    </div>
  );
}
