'use client';

import { signOut } from 'next-auth/react';

export function SignOutButton() {
  return (
    <button type="button" onClick={() => void signOut({ callbackUrl: '/sign-in' })} className="text-xs text-muted hover:text-fail">
      Sign out
    </button>
  );
}
