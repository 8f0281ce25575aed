import { Brand } from '@/components/shell/brand';

export default function AuthLayout({ children }: { children: React.ReactNode }) {
  return (
    <main className="flex min-h-screen items-center justify-center px-4 py-10">
      <div className="w-full max-w-sm">
        <div className="mb-8 flex justify-center">
          <Brand />
        </div>
        <div className="rounded-xl border border-line bg-panel p-6 shadow-2xl shadow-black/20">{children}</div>
        <p className="mt-6 text-center text-xs text-muted">Contrast, ghosts and see-through, measured from your photos.</p>
      </div>
    </main>
  );
}
