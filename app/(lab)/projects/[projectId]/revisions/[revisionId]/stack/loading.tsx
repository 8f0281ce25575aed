export default function StackLoading() {
  return (
    <div aria-busy="true" aria-label="Loading the stack planner" className="animate-pulse space-y-6">
      <div className="h-7 w-80 rounded bg-raised" />
      <div className="grid gap-6 xl:grid-cols-2">
        <div className="space-y-3">
          <div className="h-10 rounded-lg bg-raised" />
          <div className="h-32 rounded-lg bg-raised" />
          <div className="h-32 rounded-lg bg-raised" />
        </div>
        <div className="space-y-3">
          <div className="h-24 rounded-lg bg-raised" />
          <div className="h-80 rounded-lg bg-raised" />
        </div>
      </div>
    </div>
  );
}
