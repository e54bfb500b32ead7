// The problems found in a file, each with its line and column, so they can be fixed at the source.
export interface FileIssue {
  line: number | null;
  column: string | null;
  message: string;
}

export function IssueList({ issues, total, title }: { issues: FileIssue[]; total: number; title: string }) {
  return (
    <div role="alert" className="rounded border border-verdict-fails/40 bg-verdict-fails/5 px-3 py-2">
      <p className="font-semibold text-verdict-fails">{title}</p>
      <p className="text-sm text-ink-soft">
        Nothing was stored. {total > issues.length ? `${total} problems in all; the first ${issues.length} are listed.` : total === 1 ? 'One problem:' : `${total} problems:`}
      </p>
      <table className="mt-2 w-full border-collapse text-left text-base">
        <caption className="sr-only">Problems in the file</caption>
        <thead>
          <tr className="border-b border-ink/20 text-sm text-ink-soft">
            <th scope="col" className="py-1 pr-3 font-semibold">Line</th>
            <th scope="col" className="py-1 pr-3 font-semibold">Column</th>
            <th scope="col" className="py-1 font-semibold">Problem</th>
          </tr>
        </thead>
        <tbody>
          {issues.map((issue, i) => (
            <tr key={i} className="border-b border-rule align-top last:border-b-0" data-testid="file-issue">
              <td className="py-1 pr-3 font-mono text-sm">{issue.line ?? '—'}</td>
              <td className="py-1 pr-3">{issue.column ?? '—'}</td>
              <td className="py-1">{issue.message}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
