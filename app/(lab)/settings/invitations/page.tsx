import { forbidden } from 'next/navigation';
import { InviteForm, RevokeInvitationButton } from '@/components/settings/forms';
import { EmptyState, Panel } from '@/components/ui/panel';
import { listPendingInvitations } from '@/db/queries/invitations';
import { can, ROLE_LABELS } from '@/lib/auth/permissions';
import { requireActor } from '@/lib/server/auth/session';
import { formatDateTime } from '@/lib/format';

export const metadata = { title: 'Invitations' };

export default async function InvitationsPage() {
  const actor = await requireActor();
  if (!can(actor.role, 'invitation.manage')) forbidden();
  const pending = await listPendingInvitations(actor.labId);
  return (
    <div className="space-y-6">
      <Panel title="Invite someone">
        <InviteForm />
        <p className="mt-3 text-xs text-muted">The link in the mail works once and expires after 7 days.</p>
      </Panel>
      <Panel title={`Pending (${pending.length})`}>
        {pending.length === 0 ? (
          <EmptyState title="No pending invitations" />
        ) : (
          <ul className="divide-y divide-line">
            {pending.map((i) => (
              <li key={i.id} className="flex flex-wrap items-center justify-between gap-3 py-2 text-sm">
                <span>
                  {i.email} <span className="text-muted">as {ROLE_LABELS[i.role]} · expires {formatDateTime(i.expiresAt)} UTC{i.invitedBy ? ` · by ${i.invitedBy}` : ''}</span>
                </span>
                <RevokeInvitationButton id={i.id} />
              </li>
            ))}
          </ul>
        )}
      </Panel>
    </div>
  );
}
