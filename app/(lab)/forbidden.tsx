import { MissingRecord } from '@/components/ui/route-states';

// What forbidden() shows (HTTP 403): the page is of this lab, but the person's role may not see it.
export default function Forbidden() {
  return <MissingRecord title="Not for your role">Your role in this lab does not allow this page. A lab admin can change your role.</MissingRecord>;
}
