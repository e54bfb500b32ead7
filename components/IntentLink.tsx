'use client';
// A link that fetches its page ahead only when the reader reaches for it (pointer over it, or
// focus), not as soon as it is on screen. The app is one server process: prefetches of every link
// in view queue beside a page's own first requests and its code (on the derivation page they held
// up the editor's code by ~0.5 s), so links on the page frame and the derivation page use this.
import Link from 'next/link';
import { useRouter } from 'next/navigation';
import type { ComponentProps } from 'react';

type IntentLinkProps = Omit<ComponentProps<typeof Link>, 'href' | 'prefetch'> & { href: string };

export function IntentLink({ href, onMouseEnter, onFocus, ...props }: IntentLinkProps) {
  const router = useRouter();
  const prefetch = () => router.prefetch(href);
  return (
    <Link
      {...props}
      href={href}
      prefetch={false}
      onMouseEnter={(event) => {
        prefetch();
        onMouseEnter?.(event);
      }}
      onFocus={(event) => {
        prefetch();
        onFocus?.(event);
      }}
    />
  );
}
