import Link from 'next/link';
import { AcceptInvitationForm } from '@/components/auth/accept-invitation-form';
import { findOpenInvitation } from '@/db/queries/invitations';
import { ROLE_LABELS } from '@/lib/auth/permissions';

export const metadata = { title: 'Invitation' };

export default async function InvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const inv = token.length >= 10 && token.length <= 200 ? await findOpenInvitation(token) : null;
  if (!inv) {
    return (
      <div className="space-y-3">
        <h1 className="text-lg font-semibold">This invitation no longer works</h1>
        <p className="text-sm text-muted">Invitations work once and for 7 days. Ask your lab admin to invite you again.</p>
        <Link href="/sign-in" className="text-sm text-beam">
          Sign in
        </Link>
      </div>
    );
  }
  return (
    <div className="space-y-4">
      <h1 className="text-lg font-semibold">Join {inv.labName}</h1>
      <p className="text-sm text-muted">
        You are invited as <strong className="text-ink">{ROLE_LABELS[inv.role]}</strong>.
      </p>
      <AcceptInvitationForm token={token} email={inv.email} accountExists={inv.accountExists} />
    </div>
  );
}
