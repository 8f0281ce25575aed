import Link from 'next/link';

export default function RevisionNotFound() {
  return (
    <div className="mx-auto max-w-lg py-16 text-center">
      <h2 className="text-lg font-semibold">No such revision</h2>
      <p className="mt-2 text-sm text-muted">It was deleted, or it belongs to another project or lab.</p>
      <Link href="/projects" className="mt-4 inline-block text-sm text-beam">
        All projects
      </Link>
    </div>
  );
}
