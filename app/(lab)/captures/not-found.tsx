import { MissingRecord } from '@/components/ui/route-states';

export default function CaptureNotFound() {
  return <MissingRecord title="No such capture set">It was deleted, or it belongs to another lab.</MissingRecord>;
}
