// "A version locked": one mail to each member of the group, through the shared templates.
import { eq } from 'drizzle-orm';
import { getDb, schema } from '../../db/client';
import { sendMail } from '../mail';
import { versionLockedMail } from '../mailTemplates';
import type { VersionDetail } from './types';

export function versionPath(version: Pick<VersionDetail, 'derivationId' | 'id'>): string {
  return `/derivations/${version.derivationId}/versions/${version.id}`;
}

export async function announceLock(input: { groupId: string; version: VersionDetail; lockedBy: { name: string }; origin: string }): Promise<void> {
  const members = await getDb()
    .select({ email: schema.users.email })
    .from(schema.memberships)
    .innerJoin(schema.users, eq(schema.users.id, schema.memberships.userId))
    .where(eq(schema.memberships.groupId, input.groupId));
  const { version } = input;
  const mail = versionLockedMail({
    lockedBy: input.lockedBy.name,
    derivationTitle: version.derivation.title,
    groupName: version.derivation.groupName,
    versionNumber: version.number,
    versionName: version.name,
    claims: version.summary.claims,
    sha256: version.locked?.sha256 ?? '',
    link: `${input.origin}${versionPath(version)}`,
  });
  for (const member of members) {
    await sendMail({ to: member.email, ...mail });
  }
}
