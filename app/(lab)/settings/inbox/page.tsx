import { notFound } from 'next/navigation';
import { EmptyState, Notice, Panel } from '@/components/ui/panel';
import { requireActor } from '@/lib/auth/session';
import { getEnv } from '@/lib/env';
import { listCaughtMail } from '@/lib/mail/inbox';

export const metadata = { title: 'Local inbox' };
export const dynamic = 'force-dynamic';

export default async function InboxPage() {
  await requireActor();
  if (getEnv().MAIL_CATCHER !== '1') notFound();
  const mails = await listCaughtMail();
  return (
    <div className="space-y-4">
      <Notice tone="info">Mail from this installation goes to a local catcher and never leaves the machine. Point SMTP_HOST/SMTP_PORT at a real server and set MAIL_CATCHER=0 to deliver it.</Notice>
      <Panel title={`Caught mail (${mails.length})`}>
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
