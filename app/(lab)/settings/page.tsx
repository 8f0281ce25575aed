import { DataTable } from '@/components/ui/data-table';
import { PageTitle, Panel } from '@/components/ui/panel';
import { listMembers } from '@/db/queries/members';
import { ROLE_LABELS } from '@/lib/auth/permissions';
import { requireActor } from '@/lib/auth/session';
import { formatDate } from '@/lib/format';

export const metadata = { title: 'Lab settings' };

export default async function SettingsPage() {
  const actor = await requireActor();
  const members = await listMembers(actor.labId);
  return (
    <>
      <PageTitle kicker={actor.labName} title="Lab settings" />
      <Panel title={`Members (${members.length})`}>
        <DataTable
          csvName="veilmeter-members"
          columns={[
            { key: 'name', label: 'Name' },
            { key: 'email', label: 'E-mail' },
            { key: 'role', label: 'Role' },
            { key: 'since', label: 'Member since' },
          ]}
          rows={members.map((m) => ({
            id: m.userId,
            cells: { name: { text: m.name }, email: { text: m.email }, role: { text: ROLE_LABELS[m.role] }, since: { text: formatDate(m.since), sort: m.since.getTime() } },
          }))}
        />
        <p className="mt-3 text-xs text-muted">Roles: admins manage the lab; leads own projects, revisions, stacks and targets; testers capture and analyse; viewers read.</p>
      </Panel>
    </>
  );
}
