// Input rules of versions, the lock and share links, shared by the forms and the route handlers.
import { z } from 'zod';

export const MAX_VERSION_NAME = 120;
export const MAX_SHARE_NOTE = 200;
export const MAX_SHARE_DAYS = 365;

export const versionNameSchema = z
  .string({ message: 'Enter a name for the version.' })
  .trim()
  .min(1, 'Enter a name for the version.')
  .max(MAX_VERSION_NAME, `Keep the name to at most ${MAX_VERSION_NAME} characters.`);

export const saveVersionSchema = z.object({ name: versionNameSchema });
export const renameVersionSchema = z.object({ name: versionNameSchema });

/** Locking the working copy: an optional name for the new version. */
export const lockSchema = z.object({
  name: z.string().trim().max(MAX_VERSION_NAME, `Keep the name to at most ${MAX_VERSION_NAME} characters.`).optional(),
});

export const shareLinkSchema = z.object({
  days: z
    .number({ message: 'Give the number of days the link works.' })
    .int('Give a whole number of days.')
    .min(1, 'A share link works for at least 1 day.')
    .max(MAX_SHARE_DAYS, `A share link works for at most ${MAX_SHARE_DAYS} days.`),
  note: z.string().trim().max(MAX_SHARE_NOTE, `Keep the note to at most ${MAX_SHARE_NOTE} characters.`).default(''),
});

export const compareQuerySchema = z.object({
  from: z.uuid('Choose the earlier version to compare.'),
  to: z.union([z.uuid(), z.literal('working')], { message: 'Choose the later version to compare (or the working copy).' }),
});
