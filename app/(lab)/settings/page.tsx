import { MemberControls } from '@/components/settings/forms';
import { DataTable } from '@/components/ui/data-table';
import { Panel } from '@/components/ui/panel';
import { listMembers } from '@/db/queries/members';
import { can, ROLE_LABELS } from '@/lib/auth/permissions';
import { requireActor } from '@/lib/server/auth/session';
import { formatDate } from '@/lib/format';

export const metadata = { title: 'Lab settings' };

export default async function MembersPage() {
  const actor = await requireActor();
  const members = await listMembers(actor.labId);
  const manage = can(actor.role, 'member.manage');
  return (
    <div className="space-y-6">
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
        <p className="mt-3 text-xs text-muted">Admins manage the lab; leads own projects, revisions, stacks and targets; testers capture and analyse; viewers read.</p>
      </Panel>
      {manage ? (
        <Panel title="Change roles">
          <ul className="divide-y divide-line">
            {members.map((m) => (
              <li key={m.userId} className="flex flex-wrap items-center justify-between gap-3 py-2" data-testid={`member-${m.email}`}>
                <span className="text-sm">
                  {m.name} <span className="text-muted">· {m.email}</span>
                </span>
                <MemberControls userId={m.userId} role={m.role} name={m.name} />
              </li>
            ))}
          </ul>
          <p className="mt-3 text-xs text-muted">A lab always keeps at least one admin: the last one cannot be demoted or removed.</p>
        </Panel>
      ) : null}
    </div>
  );
}
