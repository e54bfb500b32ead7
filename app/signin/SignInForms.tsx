'use client';
import { zodResolver } from '@hookform/resolvers/zod';
import { signIn } from 'next-auth/react';
import Link from 'next/link';
import { useRouter, useSearchParams } from 'next/navigation';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button, Notice, PageTitle, TextField } from '@/components/ui';
import { safeReturnPath } from '../_lib/fetchJson';
import { linkRequestSchema, signInSchema } from '../_lib/schemas';
import { signInErrorMessage } from '../_lib/signInErrors';

type PasswordForm = z.input<typeof signInSchema>;
type LinkForm = z.input<typeof linkRequestSchema>;

export function SignInForms() {
  const router = useRouter();
  const search = useSearchParams();
  const returnTo = safeReturnPath(search.get('callbackUrl'));
  const urlError = signInErrorMessage(search.get('error'));
  const [linkSentTo, setLinkSentTo] = useState<string | null>(null);

  const password = useForm<PasswordForm>({
    resolver: zodResolver(signInSchema),
    defaultValues: { email: search.get('email') ?? '', password: '' },
  });
  const link = useForm<LinkForm>({ resolver: zodResolver(linkRequestSchema), defaultValues: { email: search.get('email') ?? '' } });

  const onPassword = password.handleSubmit(async (values) => {
    const result = await signIn('credentials', { redirect: false, email: values.email, password: values.password });
    if (!result || result.error) {
      password.setError('password', { message: signInErrorMessage(result?.error) ?? 'Signing in did not work.' });
      return;
    }
    router.replace(returnTo);
    router.refresh();
  });

  const onLink = link.handleSubmit(async (values) => {
    const result = await signIn('email', { redirect: false, email: values.email, callbackUrl: returnTo });
    if (!result || result.error) {
      link.setError('email', { message: signInErrorMessage(result?.error) ?? 'The link could not be sent.' });
      return;
    }
    setLinkSentTo(values.email.trim().toLowerCase());
  });

  return (
    <div className="max-w-md">
      <PageTitle>Sign in</PageTitle>
      {urlError && <Notice kind="error">{urlError}</Notice>}

      <form onSubmit={onPassword} noValidate className="mt-6 flex flex-col gap-4" aria-label="Sign in with password">
        <TextField id="signin-email" label="E-mail" type="email" autoComplete="email" error={password.formState.errors.email?.message} {...password.register('email')} />
        <TextField
          id="signin-password"
          label="Password"
          type="password"
          autoComplete="current-password"
          error={password.formState.errors.password?.message}
          {...password.register('password')}
        />
        <div className="flex items-center gap-4">
          <Button type="submit" busy={password.formState.isSubmitting}>
            Sign in
          </Button>
          <Link href={`/register${search.get('callbackUrl') ? `?callbackUrl=${encodeURIComponent(returnTo)}` : ''}`} className="text-accent underline-offset-2 hover:underline">
            No account yet? Register
          </Link>
        </div>
      </form>

      <form onSubmit={onLink} noValidate className="mt-10 flex flex-col gap-4 border-t border-rule pt-6" aria-label="Sign in with a link by e-mail">
        <p className="text-ink-soft">Or get a one-time sign-in link by e-mail.</p>
        <TextField id="link-email" label="E-mail" type="email" autoComplete="email" error={link.formState.errors.email?.message} {...link.register('email')} />
        <div>
          <Button type="submit" kind="quiet" busy={link.formState.isSubmitting}>
            Send me a sign-in link
          </Button>
        </div>
        {linkSentTo && (
          <Notice kind="done">
            A sign-in link is on its way to {linkSentTo}. It works once. <Link href="/signin/check-mail" className="underline">What next?</Link>
          </Notice>
        )}
      </form>
    </div>
  );
}
