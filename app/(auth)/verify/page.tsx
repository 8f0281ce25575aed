import { redirect } from 'next/navigation';
import { ResendVerificationForm } from '@/components/auth/resend-verification-form';
import { SignOutButton } from '@/components/shell/sign-out-button';
import { getActor, getUnverifiedUser } from '@/lib/server/auth/session';

export const metadata = { title: 'Confirm your address' };
export const dynamic = 'force-dynamic';

// All a signed-in person with an unconfirmed address can reach: this page, the link, and sign-out.
export default async function VerifyPage() {
  const user = await getUnverifiedUser();
  if (!user) redirect((await getActor()) ? '/projects' : '/sign-in');
  return (
    <div className="space-y-4">
      <h1 className="text-lg font-semibold">Confirm your address</h1>
      <p className="text-sm text-muted">
        We sent a link to <strong className="text-ink">{user.email}</strong>. Open it to confirm the address is yours; until then this account can do nothing else.
      </p>
      <ResendVerificationForm />
      <div className="flex justify-end">
        <SignOutButton />
      </div>
    </div>
  );
}
