/** An issue shown beside a field: its in-memory path, the rule, and how bad it is. */
export interface FieldIssue {
  path: string;
  rule: string;
  severity: 'error' | 'warning';
}
