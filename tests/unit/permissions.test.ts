// The role rule table, checked role by role against the roles table of DESIGN.md ("Roles (per
// research group)"), written out here independently of server/permissions.ts.
import { describe, expect, test } from 'vitest';
import { actions, allowedActions, may, roles, ruleTable, type Action, type Role } from '@/server/permissions';

// From DESIGN.md: lead = everything an author may + invite, remove, change roles, lock, share links;
// author = create and edit derivations, save versions, upload data; reviewer = read, run checks,
// leave and resolve remarks, sign off steps, no edits; reader = read, run checks locally, nothing written.
// Our readings where DESIGN.md is silent: authors take part in remark threads; a lead may sign off;
// storing check results is a write, so readers may not.
const expected: Record<Action, Record<Role, boolean>> = {
  read: { lead: true, author: true, reviewer: true, reader: true },
  runChecks: { lead: true, author: true, reviewer: true, reader: true },
  recordChecks: { lead: true, author: true, reviewer: true, reader: false },
  createDerivation: { lead: true, author: true, reviewer: false, reader: false },
  renameDerivation: { lead: true, author: true, reviewer: false, reader: false },
  deleteDerivation: { lead: true, author: true, reviewer: false, reader: false },
  editText: { lead: true, author: true, reviewer: false, reader: false },
  saveVersion: { lead: true, author: true, reviewer: false, reader: false },
  uploadDataset: { lead: true, author: true, reviewer: false, reader: false },
  remark: { lead: true, author: true, reviewer: true, reader: false },
  resolveRemark: { lead: true, author: true, reviewer: true, reader: false },
  signOff: { lead: true, author: false, reviewer: true, reader: false },
  lock: { lead: true, author: false, reviewer: false, reader: false },
  shareLink: { lead: true, author: false, reviewer: false, reader: false },
  invite: { lead: true, author: false, reviewer: false, reader: false },
  removeMember: { lead: true, author: false, reviewer: false, reader: false },
  changeRole: { lead: true, author: false, reviewer: false, reader: false },
  manageGroup: { lead: true, author: false, reviewer: false, reader: false },
};

describe('the role rule table', () => {
  test('covers exactly the actions the product knows, for exactly the four roles', () => {
    expect([...actions].sort()).toEqual(Object.keys(expected).sort());
    expect(Object.keys(ruleTable).sort()).toEqual(Object.keys(expected).sort());
    expect([...roles]).toEqual(['lead', 'author', 'reviewer', 'reader']);
  });

  for (const action of Object.keys(expected) as Action[]) {
    for (const role of ['lead', 'author', 'reviewer', 'reader'] as const) {
      const allowed = expected[action][role];
      test(`a ${role} ${allowed ? 'may' : 'may not'} ${action}`, () => {
        expect(may(role, action)).toBe(allowed);
      });
    }
  }

  test('someone who is not a member may do nothing at all', () => {
    for (const action of actions) {
      expect(may(null, action)).toBe(false);
      expect(may(undefined, action)).toBe(false);
    }
    expect(allowedActions(null)).toEqual([]);
  });

  test('a lead may do everything an author may', () => {
    for (const action of actions) if (may('author', action)) expect(may('lead', action)).toBe(true);
  });

  test('a reader writes nothing: only reading and local checks are open to them', () => {
    expect(allowedActions('reader').sort()).toEqual(['read', 'runChecks']);
  });

  test('a reviewer never edits the text', () => {
    expect(may('reviewer', 'editText')).toBe(false);
    expect(may('reviewer', 'saveVersion')).toBe(false);
  });
});
