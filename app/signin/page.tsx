import type { Metadata } from 'next';
import { Suspense } from 'react';
import { SignInForms } from './SignInForms';

export const metadata: Metadata = { title: 'Sign in' };

export default function SignInPage() {
  return (
    <Suspense>
      <SignInForms />
    </Suspense>
  );
}
