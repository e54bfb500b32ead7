// Input rules shared by the forms (react-hook-form + zod) and the route handlers, so a field is
// refused with the same message in the browser and on the server.
import { z } from 'zod';

export const roleValues = ['lead', 'author', 'reviewer', 'reader'] as const;
export const roleSchema = z.enum(roleValues, { message: 'Choose a role: lead, author, reviewer or reader.' });

export const MAX_TITLE = 200;
export const MAX_GROUP_NAME = 120;
export const MAX_DESCRIPTION = 2000;
export const MAX_NAME = 120;
export const MIN_PASSWORD = 10;
export const MAX_PASSWORD_BYTES = 72;

const requiredText = (what: string, max: number) =>
  z
    .string({ message: `Enter ${what}.` })
    .trim()
    .min(1, `Enter ${what}.`)
    .max(max, `Keep ${what} to at most ${max} characters.`);

export const emailSchema = z
  .string({ message: 'Enter an e-mail address.' })
  .trim()
  .min(1, 'Enter an e-mail address.')
  .max(254, 'This e-mail address is too long.')
  .pipe(z.email('Enter a valid e-mail address, like name@example.org.'))
  .transform((email) => email.toLowerCase());

export const passwordSchema = z
  .string({ message: 'Enter a password.' })
  .min(MIN_PASSWORD, `Use at least ${MIN_PASSWORD} characters.`)
  .refine((p) => new TextEncoder().encode(p).length <= MAX_PASSWORD_BYTES, `Keep the password to at most ${MAX_PASSWORD_BYTES} bytes.`);

export const registerSchema = z.object({
  name: requiredText('your name', MAX_NAME),
  email: emailSchema,
  password: passwordSchema,
  invitation: z.string().max(200).optional(),
});

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, 'Enter your password.'),
});

export const linkRequestSchema = z.object({ email: emailSchema });

export const groupSchema = z.object({
  name: requiredText('a group name', MAX_GROUP_NAME),
  description: z.string().trim().max(MAX_DESCRIPTION, `Keep the description to at most ${MAX_DESCRIPTION} characters.`).default(''),
});
export const groupUpdateSchema = groupSchema.partial();

export const inviteSchema = z.object({ email: emailSchema, role: roleSchema });
export const roleChangeSchema = z.object({ role: roleSchema });

export const derivationSchema = z.object({ title: requiredText('a title', MAX_TITLE) });

export const idSchema = z.uuid();
