import Link from 'next/link';

export default function NotFound() {
  return (
    <main className="flex min-h-screen items-center justify-center px-4">
      <div className="text-center">
        <p className="font-mono text-sm text-beam">404</p>
        <h1 className="mt-2 text-xl font-semibold">Nothing here</h1>
        <p className="mt-2 text-sm text-muted">This page does not exist, or it belongs to a lab you are not a member of.</p>
        <Link href="/projects" className="mt-4 inline-block text-sm text-beam">
          Back to projects
        </Link>
      </div>
    </main>
  );
}
