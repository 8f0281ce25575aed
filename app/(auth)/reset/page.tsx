import { ResetRequestForm } from '@/components/auth/reset-forms';

export const metadata = { title: 'Reset password' };

export default function ResetPage() {
  return <ResetRequestForm />;
}
