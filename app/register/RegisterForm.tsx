'use client';
import { zodResolver } from '@hookform/resolvers/zod';
import { signIn } from 'next-auth/react';
import Link from 'next/link';
import { useRouter, useSearchParams } from 'next/navigation';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { Button, Notice, PageTitle, TextField } from '@/components/ui';
import { ApiFailure, fetchJson, safeReturnPath } from '../_lib/fetchJson';
import { registerSchema } from '../_lib/schemas';

const formSchema = registerSchema
  .extend({ confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'The two passwords differ.' });
type RegisterValues = z.input<typeof formSchema>;
type FieldName = keyof RegisterValues;

export function RegisterForm() {
  const router = useRouter();
  const search = useSearchParams();
  const invitation = search.get('invitation') ?? undefined;
  const invitedEmail = search.get('email') ?? '';
  const form = useForm<RegisterValues>({
    resolver: zodResolver(formSchema),
    defaultValues: { name: '', email: invitedEmail, password: '', confirm: '', invitation },
  });
  const { errors, isSubmitting } = form.formState;

  const onSubmit = form.handleSubmit(async ({ confirm: _confirm, ...values }) => {
    try {
      const created = await fetchJson<{ joinedGroupId: string | null }>('/api/register', { method: 'POST', body: values });
      const result = await signIn('credentials', { redirect: false, email: values.email, password: values.password });
      if (!result || result.error) {
        router.replace(`/signin?email=${encodeURIComponent(values.email)}`);
        return;
      }
      router.replace(created.joinedGroupId ? `/groups/${created.joinedGroupId}` : safeReturnPath(search.get('callbackUrl')));
      router.refresh();
    } catch (error) {
      const failure = error instanceof ApiFailure ? error : null;
      const field = failure?.field as FieldName | undefined;
      form.setError(field && field in form.getValues() ? field : 'root.server', {
        message: failure?.message ?? 'Registering did not work. Try again.',
      });
    }
  });

  return (
    <div className="max-w-md">
      <PageTitle>Register</PageTitle>
      {invitation && <p className="mb-4 text-ink-soft">Register to accept your invitation; you join the group straight away.</p>}
      {errors.root?.server && <Notice kind="error">{errors.root.server.message}</Notice>}
      <form onSubmit={onSubmit} noValidate className="mt-4 flex flex-col gap-4" aria-label="Register">
        <TextField id="register-name" label="Name" autoComplete="name" error={errors.name?.message} {...form.register('name')} />
        <TextField
          id="register-email"
          label="E-mail"
          type="email"
          autoComplete="email"
          readOnly={Boolean(invitation && invitedEmail)}
          error={errors.email?.message}
          {...form.register('email')}
        />
        <TextField
          id="register-password"
          label="Password"
          type="password"
          autoComplete="new-password"
          hint="At least 10 characters."
          error={errors.password?.message}
          {...form.register('password')}
        />
        <TextField id="register-confirm" label="Password again" type="password" autoComplete="new-password" error={errors.confirm?.message} {...form.register('confirm')} />
        <div className="flex items-center gap-4">
          <Button type="submit" busy={isSubmitting}>
            Register
          </Button>
          <Link href="/signin" className="text-accent underline-offset-2 hover:underline">
            Have an account? Sign in
          </Link>
        </div>
      </form>
    </div>
  );
}
