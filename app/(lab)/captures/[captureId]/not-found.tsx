import Link from 'next/link';
import { EmptyState } from '@/components/ui/panel';

export default function CaptureNotFound() {
  return (
    <EmptyState title="No such capture set in this lab">
      <Link href="/projects" className="text-beam hover:underline">
        Back to projects
      </Link>
    </EmptyState>
  );
}
