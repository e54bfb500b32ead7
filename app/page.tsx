import Link from 'next/link';
import { redirect } from 'next/navigation';
import { currentUser } from './_lib/session';

export default async function Home() {
  if (await currentUser()) redirect('/groups');
  return (
    <div className="max-w-2xl">
      <h1 className="text-4xl">Marginalia</h1>
      <p className="mt-4 text-xl leading-relaxed text-ink-soft">
        Renormalization-group derivations, written together and checked step by step.
      </p>
      <p className="mt-6 text-lg leading-relaxed">
        Co-authors write a derivation at the same time; every quantitative step carries a claim that the built-in
        solver checks — fixed points, eigenvalues, epsilon-expansion coefficients, log-correction exponents. A group
        lead locks a version once every claim holds, and readers follow the locked derivation with its trajectory plots.
      </p>
      <div className="mt-8 flex gap-4">
        <Link href="/signin" className="rounded border border-accent bg-accent px-4 py-2 text-paper hover:bg-accent-strong">
          Sign in
        </Link>
        <Link href="/register" className="rounded border border-rule px-4 py-2 hover:border-ink-faint">
          Register
        </Link>
      </div>
    </div>
  );
}
