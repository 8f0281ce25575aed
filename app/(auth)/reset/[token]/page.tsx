import Link from 'next/link';
import { ResetCompleteForm } from '@/components/auth/reset-forms';
import { isResetUsable } from '@/db/queries/password-resets';

export const metadata = { title: 'New password' };

export default async function ResetTokenPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  if (!(await isResetUsable(token))) {
    return (
      <div className="space-y-3">
        <h1 className="text-lg font-semibold">This link no longer works</h1>
        <p className="text-sm text-muted">Reset links work once and for one hour.</p>
        <Link href="/reset" className="text-sm text-beam">
          Ask for a new link
        </Link>
      </div>
    );
  }
  return <ResetCompleteForm token={token} />;
}
