import { forbidden } from 'next/navigation';
import { CreateWebhookForm, DeleteWebhookButton } from '@/components/settings/webhook-forms';
import { EmptyState, Panel } from '@/components/ui/panel';
import { listWebhooks } from '@/db/queries/webhooks';
import { can } from '@/lib/auth/permissions';
import { requireActor } from '@/lib/server/auth/session';
import { formatDateTime } from '@/lib/format';
import { WEBHOOK_ATTEMPTS } from '@/lib/server/webhooks/runner';

export const metadata = { title: 'Webhooks' };

export default async function WebhooksPage() {
  const actor = await requireActor();
  if (!can(actor.role, 'token.manage')) forbidden();
  const hooks = await listWebhooks(actor.labId);
  return (
    <div className="space-y-6">
      <Panel title="New webhook">
        <CreateWebhookForm />
        <div className="mt-3 space-y-1 text-xs text-muted">
          <p>
            Veilmeter posts JSON <code className="font-mono">{'{ id, event, createdAt, data }'}</code> to the address when an analysis is done or failed and when a target turns to failing or passing.
            Each post carries <code className="font-mono">Veilmeter-Signature: t=…,v1=…</code>: the HMAC-SHA256, under the signing secret, of the time, a dot and the body. Check it and the time
            (within five minutes) before trusting a post.
          </p>
          <p>An answer other than 2xx is retried with growing waits, {WEBHOOK_ATTEMPTS} attempts in all. Local and private addresses are refused unless the server allows them.</p>
        </div>
      </Panel>
      <Panel title="Webhooks of this lab">
        {hooks.length === 0 ? (
          <EmptyState title="No webhooks yet" />
        ) : (
          <ul className="divide-y divide-line">
            {hooks.map((h) => (
              <li key={h.id} className="flex flex-wrap items-center justify-between gap-3 py-2 text-sm">
                <span>
                  <code className="font-mono text-xs">{h.url}</code>
                  <span className="text-muted">
                    {' '}
                    · {h.events.join(', ')} · since {formatDateTime(h.createdAt)} UTC · {h.delivered} delivered, {h.pending} waiting, {h.failed} failed
                    {h.lastError ? ` · last error: ${h.lastError}` : ''}
                  </span>
                </span>
                <DeleteWebhookButton id={h.id} />
              </li>
            ))}
          </ul>
        )}
      </Panel>
    </div>
  );
}
