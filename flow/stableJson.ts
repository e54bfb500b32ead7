// JSON with object keys in sorted order and no spaces, so equal content gives equal text whatever
// the order its keys were written in (undefined members left out, as JSON.stringify does). The one
// canonical form behind every fingerprint and content hash: check results cached by the page and
// the server, review's step hashes and a version's content hash.

export function stableJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(stableJson).join(',')}]`;
  if (value && typeof value === 'object') {
    const entries = Object.entries(value as Record<string, unknown>)
      .filter(([, v]) => v !== undefined)
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${stableJson(v)}`).join(',')}}`;
  }
  return JSON.stringify(value) ?? 'null';
}
