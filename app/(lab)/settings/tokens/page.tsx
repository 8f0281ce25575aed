import Link from 'next/link';
import { forbidden } from 'next/navigation';
import { CreateTokenForm, RevokeTokenButton } from '@/components/settings/forms';
import { EmptyState, Panel } from '@/components/ui/panel';
import { listApiTokens } from '@/db/queries/api-tokens';
import { can } from '@/lib/auth/permissions';
import { requireActor } from '@/lib/server/auth/session';
import { formatDateTime } from '@/lib/format';

export const metadata = { title: 'API tokens' };

export default async function TokensPage() {
  const actor = await requireActor();
  if (!can(actor.role, 'token.self')) forbidden();
  const all = can(actor.role, 'token.manage');
  const tokens = await listApiTokens(actor.labId, actor.user.id, all);
  return (
    <div className="space-y-6">
      <Panel title="New token for a capture rig">
        <CreateTokenForm />
        <p className="mt-3 text-xs text-muted">A token acts as you, with your role in this lab, limited to its scopes. Send it as <code className="font-mono">Authorization: Bearer …</code> to the /api/v1 routes: the <Link href="/api-reference" className="text-glow underline">rig API reference</Link> lists each route and the scope it needs.</p>
      </Panel>
      <Panel title={all ? 'All tokens of this lab' : 'Your tokens'}>
        {tokens.length === 0 ? (
          <EmptyState title="No tokens yet" />
        ) : (
          <ul className="divide-y divide-line">
            {tokens.map((t) => (
              <li key={t.id} className="flex flex-wrap items-center justify-between gap-3 py-2 text-sm" data-testid={`token-${t.prefix}`}>
                <span>
                  <span className="font-medium">{t.name}</span> <code className="font-mono text-xs text-muted">vmk_{t.prefix}_…</code>
                  <span className="text-muted">
                    {' '}
                    · {t.scopes.join(', ')} · {all ? `${t.userEmail} · ` : ''}last used {t.lastUsedAt ? `${formatDateTime(t.lastUsedAt)} UTC` : 'never'}
                  </span>
                </span>
                {t.revokedAt ? <span className="text-xs text-fail">revoked {formatDateTime(t.revokedAt)}</span> : <RevokeTokenButton id={t.id} />}
              </li>
            ))}
          </ul>
        )}
      </Panel>
    </div>
  );
}
