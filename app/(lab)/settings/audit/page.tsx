import { forbidden } from 'next/navigation';
import { DataTable } from '@/components/ui/data-table';
import { EmptyState, Panel } from '@/components/ui/panel';
import { listAuditEvents } from '@/db/queries/audit';
import { can } from '@/lib/auth/permissions';
import { requireActor } from '@/lib/server/auth/session';
import { formatDateTime } from '@/lib/format';

export const metadata = { title: 'Audit trail' };

export default async function AuditPage() {
  const actor = await requireActor();
  if (!can(actor.role, 'audit.read')) forbidden();
  const events = await listAuditEvents(actor.labId, 500);
  return (
    <Panel title="Audit trail (newest 500)">
      <DataTable
        csvName="veilmeter-audit"
        columns={[
          { key: 'when', label: 'When (UTC)' },
          { key: 'who', label: 'Who' },
          { key: 'action', label: 'Action' },
          { key: 'target', label: 'Target' },
          { key: 'details', label: 'Details' },
        ]}
        rows={events.map((e) => ({
          id: e.id,
          cells: {
            when: { text: formatDateTime(e.createdAt), sort: e.createdAt.getTime() },
            who: { text: e.userEmail ?? '—' },
            action: { text: e.action },
            target: { text: e.targetType ? `${e.targetType} ${e.targetId?.slice(0, 8) ?? ''}` : '—' },
            details: { text: Object.keys(e.details).length ? JSON.stringify(e.details) : '' },
          },
        }))}
        empty={<EmptyState title="Nothing recorded yet" />}
      />
    </Panel>
  );
}
