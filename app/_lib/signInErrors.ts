// Words for the error codes next-auth puts in ?error= (our own messages pass through as they are).
const known: Record<string, string> = {
  Verification: 'This sign-in link has expired or has already been used. Ask for a new one below.',
  CredentialsSignin: 'Wrong e-mail or password.',
  EmailSignin: 'The sign-in link could not be sent. Check the address and try again.',
  AccessDenied: 'Signing in was refused.',
  SessionRequired: 'Sign in to see that page.',
  Configuration: 'Signing in is not set up correctly on this server.',
  Default: 'Signing in did not work. Try again.',
};

export function signInErrorMessage(code: string | null | undefined): string | null {
  if (!code) return null;
  const clean = code.replace(/^Error: /, '');
  return known[clean] ?? clean;
}
