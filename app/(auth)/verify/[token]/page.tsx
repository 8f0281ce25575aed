import Link from 'next/link';
import { confirmEmail } from '@/lib/server/auth/accounts';

export const metadata = { title: 'Address confirmed' };
export const dynamic = 'force-dynamic';

// The link from the verification mail: opening it proves the address (it works once, for 48 hours).
export default async function ConfirmPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  if (!(await confirmEmail(token))) {
    return (
      <div className="space-y-3">
        <h1 className="text-lg font-semibold">This link no longer works</h1>
        <p className="text-sm text-muted">Confirmation links work once and for 48 hours. Sign in to ask for a new one.</p>
        <Link href="/sign-in" className="text-sm text-beam">
          Sign in
        </Link>
      </div>
    );
  }
  return (
    <div className="space-y-3">
      <h1 className="text-lg font-semibold">Address confirmed</h1>
      <p role="status" className="text-sm text-muted">
        Your address is confirmed and your lab is ready.
      </p>
      <Link href="/projects" className="text-sm text-beam">
        Continue to your lab
      </Link>
    </div>
  );
}
