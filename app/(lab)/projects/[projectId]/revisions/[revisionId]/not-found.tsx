import Link from 'next/link';
import { EmptyState } from '@/components/ui/panel';

export default function RevisionNotFound() {
  return (
    <EmptyState title="No such revision in this lab">
      <Link href="/projects" className="text-beam hover:underline">
        Back to projects
      </Link>
    </EmptyState>
  );
}
