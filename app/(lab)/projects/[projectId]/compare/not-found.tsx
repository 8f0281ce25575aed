import Link from 'next/link';

export default function ProjectNotFound() {
  return (
    <div className="mx-auto max-w-lg py-16 text-center">
      <h2 className="text-lg font-semibold">No such project</h2>
      <p className="mt-2 text-sm text-muted">It was deleted, or it belongs to another lab.</p>
      <Link href="/projects" className="mt-4 inline-block text-sm text-beam">
        All projects
      </Link>
    </div>
  );
}
