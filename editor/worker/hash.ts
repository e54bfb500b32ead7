// A stable fingerprint of plain data: JSON with sorted keys, hashed to 106 bits (two 53-bit
// halves). Used as the key of cached check results: the same claim and flow give the same key.

import { stableJson } from '@/flow/stableJson';

/** 53 bits of a string (cyrb53: two multiplicative 32-bit lanes mixed at the end). */
function hash53(text: string, start: number): number {
  let h1 = 0xdeadbeef ^ start;
  let h2 = 0x41c6ce57 ^ start;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    h1 = Math.imul(h1 ^ c, 2654435761);
    h2 = Math.imul(h2 ^ c, 1597334677);
  }
  h1 = Math.imul(h1 ^ (h1 >>> 16), 2246822507) ^ Math.imul(h2 ^ (h2 >>> 13), 3266489909);
  h2 = Math.imul(h2 ^ (h2 >>> 16), 2246822507) ^ Math.imul(h1 ^ (h1 >>> 13), 3266489909);
  return 4294967296 * (2097151 & h2) + (h1 >>> 0);
}

export function fingerprint(value: unknown): string {
  const text = stableJson(value);
  return `${hash53(text, 1).toString(36)}.${hash53(text, 7).toString(36)}.${text.length.toString(36)}`;
}
