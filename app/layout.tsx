import type { Metadata } from 'next';
import { IntentLink } from '@/components/IntentLink';
import type { ReactNode } from 'react';
import '@fontsource/eb-garamond/400.css';
import '@fontsource/eb-garamond/400-italic.css';
import '@fontsource/eb-garamond/600.css';
import '@fontsource/jetbrains-mono/400.css';
import 'katex/dist/katex.min.css';
import './globals.css';
import { sinkInUse } from '@/server/mail';
import { currentUser } from './_lib/session';
import { Providers } from './providers';
import { SignOutButton } from './SignOutButton';

export const metadata: Metadata = {
  title: { default: 'Marginalia', template: '%s · Marginalia' },
  description: 'Renormalization-group derivations, written together and checked step by step.',
};

export default async function RootLayout({ children }: { children: ReactNode }) {
  const user = await currentUser();
  const mailbox = sinkInUse();
  return (
    <html lang="en">
      <body className="min-h-screen bg-paper font-serif text-ink antialiased">
        <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-3 focus:top-3 focus:bg-paper focus:px-2">
          Skip to content
        </a>
        <header className="border-b border-rule">
          <nav aria-label="Main" className="mx-auto flex max-w-5xl items-baseline gap-6 px-6 py-3">
            <IntentLink href={user ? '/groups' : '/'} className="text-xl tracking-[0.08em] text-ink [font-variant:small-caps]">
              Marginalia
            </IntentLink>
            {user && (
              <IntentLink href="/groups" className="text-ink-soft hover:text-ink">
                Groups
              </IntentLink>
            )}
            <span className="flex-1" />
            {mailbox && (
              <IntentLink href="/mailbox" className="text-ink-soft hover:text-ink">
                Mailbox
              </IntentLink>
            )}
            {user ? (
              <>
                <span className="text-ink-soft" aria-label="Signed in as">
                  {user.name}
                </span>
                <SignOutButton userId={user.id} />
              </>
            ) : (
              <>
                <IntentLink href="/signin" className="text-ink-soft hover:text-ink">
                  Sign in
                </IntentLink>
                <IntentLink href="/register" className="text-ink-soft hover:text-ink">
                  Register
                </IntentLink>
              </>
            )}
          </nav>
        </header>
        <Providers>
          <main id="main" className="mx-auto max-w-5xl px-6 py-8">
            {children}
          </main>
        </Providers>
      </body>
    </html>
  );
}
