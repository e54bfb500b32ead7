'use client';
import { signOut } from 'next-auth/react';

export function SignOutButton() {
  return (
    <button type="button" onClick={() => void signOut({ callbackUrl: '/' })} className="rounded text-ink-soft hover:text-ink">
      Sign out
    </button>
  );
}
