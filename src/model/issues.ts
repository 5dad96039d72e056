// Problems found in a project folder, as values with a location; and the one reporter that
// turns them into text (`file:line:col field: what is wrong, expected what`).

export type Severity = 'error' | 'warning';

export interface Issue {
  code: string; // stable machine-readable kind, e.g. "unknown-field", "missing-unit", "duplicate-id"
  severity: Severity;
  file: string; // path relative to the project folder, posix separators ("." for the folder itself)
  line: number; // 1-based; 0 where the problem has no position (a missing file)
  col: number; // 1-based; 0 where the problem has no position
  path: string; // field path inside the file, e.g. "circuits[3].cable.length"; "" for the whole file
  message: string; // what is wrong, including the offending value where there is one
  expected?: string; // what was expected, in words
  actual?: string; // the value found, as text
}

/** Issues in reading order: by file, then line, then column (then field path, then message). */
export function sortIssues(issues: readonly Issue[]): Issue[] {
  return [...issues].sort(
    (a, b) =>
      compareText(a.file, b.file) ||
      a.line - b.line ||
      a.col - b.col ||
      compareText(a.path, b.path) ||
      compareText(a.message, b.message),
  );
}

/** One line per issue, sorted; no trailing newline. Pure: the caller decides where the text goes. */
export function formatIssues(issues: readonly Issue[]): string {
  return sortIssues(issues).map(formatIssue).join('\n');
}

export function formatIssue(issue: Issue): string {
  const located = issue.line > 0;
  const location = located ? `${issue.file}:${issue.line}:${issue.col}` : issue.file;
  const severity = issue.severity === 'warning' ? ' warning:' : '';
  // A problem of a whole file has no field: "(top level)" stands in its place.
  const field = issue.path !== '' ? ` ${issue.path}:` : located ? (severity ? '' : ' (top level):') : ':';
  const expected = issue.expected === undefined ? '' : `, expected ${issue.expected}`;
  return `${location}${severity}${field} ${issue.message}${expected}`;
}

export function hasErrors(issues: readonly Issue[]): boolean {
  return issues.some((i) => i.severity === 'error');
}

/** Code-unit order, so the output does not depend on the machine's locale. */
function compareText(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
