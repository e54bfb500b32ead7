// The SHA-256 of a locked version, over its snapshot and its check report. The exact bytes hashed
// (format v1), so that anyone holding the two downloaded files can compute it again:
//
//   "marginalia locked version v1\n"
//   "snapshot <S>\n"  then the S bytes of the snapshot (GET .../snapshot, Y.encodeStateAsUpdate)
//   "\nreport <R>\n"  then the R bytes of the report (GET .../report.json, UTF-8 JSON text)
//
// where <S> and <R> are the byte lengths written in decimal. In a shell:
//
//   { printf 'marginalia locked version v1\nsnapshot %d\n' "$(stat -c %s snapshot.yjs)"; cat snapshot.yjs;
//     printf '\nreport %d\n' "$(stat -c %s report.json)"; cat report.json; } | sha256sum
import { createHash } from 'node:crypto';

export const LOCK_HASH_FORMAT = 'marginalia locked version v1';

export const LOCK_HASH_RECIPE =
  "{ printf 'marginalia locked version v1\\nsnapshot %d\\n' \"$(stat -c %s snapshot.yjs)\"; cat snapshot.yjs; " +
  "printf '\\nreport %d\\n' \"$(stat -c %s report.json)\"; cat report.json; } | sha256sum";

export function lockHash(snapshot: Uint8Array, reportText: string): string {
  const report = new TextEncoder().encode(reportText);
  return createHash('sha256')
    .update(`${LOCK_HASH_FORMAT}\nsnapshot ${snapshot.byteLength}\n`)
    .update(snapshot)
    .update(`\nreport ${report.byteLength}\n`)
    .update(report)
    .digest('hex');
}
