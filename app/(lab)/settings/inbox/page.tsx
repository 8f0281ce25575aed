import { notFound } from 'next/navigation';
import { EmptyState, Notice, Panel } from '@/components/ui/panel';
import { requireActor } from '@/lib/server/auth/session';
import { getEnv } from '@/lib/env';
import { listCaughtMailFor } from '@/lib/server/mail/inbox';

export const metadata = { title: 'Local inbox' };
export const dynamic = 'force-dynamic';

export default async function InboxPage() {
  // requireActor lets only a person with a verified address through; they see mail to that address
  const actor = await requireActor();
  if (getEnv().MAIL_CATCHER !== '1') notFound();
  const mails = await listCaughtMailFor(actor.user.email);
  return (
    <div className="space-y-4">
      <Notice tone="info">
        Mail from this installation goes to a local catcher and never leaves the machine. This page shows only mail sent to your own address, {actor.user.email}; the console that runs the catcher prints every message&apos;s links. Set SMTP_HOST (see the README&apos;s SECURITY section) and leave MAIL_CATCHER unset to deliver mail.
      </Notice>
      <Panel title={`Your caught mail (${mails.length})`}>
        {mails.length === 0 ? (
          <EmptyState title="Nothing caught yet" />
        ) : (
          <ul className="space-y-3">
            {mails.map((m) => (
              <li key={m.id} className="rounded-md border border-line p-3 text-sm">
                <div className="flex flex-wrap justify-between gap-2">
                  <strong>{m.subject}</strong>
                  <span className="text-xs text-muted">{m.receivedAt.replace('T', ' ').slice(0, 19)} UTC</span>
                </div>
                <div className="text-xs text-muted">to {m.to.join(', ')}</div>
                <pre className="mt-2 whitespace-pre-wrap font-mono text-xs text-ink">{m.text}</pre>
              </li>
            ))}
          </ul>
        )}
      </Panel>
    </div>
  );
}
