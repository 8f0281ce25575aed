import { SettingsTabs } from '@/components/settings/settings-tabs';
import { PageTitle } from '@/components/ui/panel';
import { can } from '@/lib/auth/permissions';
import { requireActor } from '@/lib/server/auth/session';
import { getEnv } from '@/lib/env';

export default async function SettingsLayout({ children }: { children: React.ReactNode }) {
  const actor = await requireActor();
  const tabs = [{ href: '/settings', label: 'Members' }];
  if (can(actor.role, 'invitation.manage')) tabs.push({ href: '/settings/invitations', label: 'Invitations' });
  if (can(actor.role, 'token.self')) tabs.push({ href: '/settings/tokens', label: 'API tokens' });
  if (can(actor.role, 'token.manage')) tabs.push({ href: '/settings/webhooks', label: 'Webhooks' });
  if (can(actor.role, 'capture.read')) tabs.push({ href: '/settings/cameras', label: 'Camera profiles' });
  if (can(actor.role, 'audit.read')) tabs.push({ href: '/settings/audit', label: 'Audit trail' });
  if (getEnv().MAIL_CATCHER === '1') tabs.push({ href: '/settings/inbox', label: 'Local inbox' });
  return (
    <>
      <PageTitle kicker={actor.labName} title="Lab settings" />
      <SettingsTabs tabs={tabs} />
      {children}
    </>
  );
}
