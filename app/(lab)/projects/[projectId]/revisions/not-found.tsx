import { MissingRecord } from '@/components/ui/route-states';

export default function RevisionNotFound() {
  return <MissingRecord title="No such revision">It was deleted, or it belongs to another project or lab.</MissingRecord>;
}
