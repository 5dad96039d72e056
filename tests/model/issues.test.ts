// The reporter: one line per issue, `file:line:col field: message, expected ...`, in reading order.

import { describe, expect, it } from 'vitest';
import { formatIssue, formatIssues, sortIssues, type Issue } from '../../src/model/issues.js';

const issue = (over: Partial<Issue>): Issue => ({
  code: 'missing-unit',
  severity: 'error',
  file: 'circuits/a.yaml',
  line: 1,
  col: 1,
  path: 'cable.length',
  message: '"45" has no unit',
  ...over,
});

describe('formatIssue', () => {
  it('prints location, field, message and what was expected', () => {
    expect(formatIssue(issue({ line: 12, col: 11, expected: 'a length such as "45 m"' }))).toBe(
      'circuits/a.yaml:12:11 cable.length: "45" has no unit, expected a length such as "45 m"',
    );
  });
  it('names a whole-file problem "(top level)", and leaves out the position where there is none', () => {
    expect(formatIssue(issue({ path: '', message: 'the file is empty' }))).toBe('circuits/a.yaml:1:1 (top level): the file is empty');
    expect(formatIssue(issue({ file: 'project.yaml', line: 0, col: 0, path: '', message: 'file not found' }))).toBe('project.yaml: file not found');
  });
  it('marks warnings', () => {
    expect(formatIssue(issue({ severity: 'warning', path: '', message: 'is not read' }))).toBe('circuits/a.yaml:1:1 warning: is not read');
  });
});

describe('formatIssues', () => {
  it('sorts by file, then line, then column, one line each', () => {
    const text = formatIssues([
      issue({ file: 'project.yaml', line: 2, col: 1, path: 'settings', message: 'c' }),
      issue({ file: 'circuits/b.yaml', line: 3, col: 9, path: 'from', message: 'b' }),
      issue({ file: 'circuits/b.yaml', line: 3, col: 2, path: 'id', message: 'a' }),
      issue({ file: 'circuits/a.yaml', line: 10, col: 1, path: 'to', message: 'z' }),
      issue({ file: 'circuits/b.yaml', line: 1, col: 5, path: 'x', message: 'y' }),
    ]);
    expect(text.split('\n')).toEqual([
      'circuits/a.yaml:10:1 to: z',
      'circuits/b.yaml:1:5 x: y',
      'circuits/b.yaml:3:2 id: a',
      'circuits/b.yaml:3:9 from: b',
      'project.yaml:2:1 settings: c',
    ]);
  });
  it('is pure: the input is not reordered', () => {
    const list = [issue({ line: 2 }), issue({ line: 1 })];
    sortIssues(list);
    expect(list.map((i) => i.line)).toEqual([2, 1]);
  });
  it('prints nothing for no issues', () => {
    expect(formatIssues([])).toBe('');
  });
});
