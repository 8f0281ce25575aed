import { MissingRecord } from '@/components/ui/route-states';

export default function ProjectNotFound() {
  return <MissingRecord title="No such project">It was deleted, or it belongs to another lab.</MissingRecord>;
}
