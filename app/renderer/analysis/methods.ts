/**
 * "Which method flew each span": the n-body flight's FlownSpan records grouped by method and
 * reason, in order of first use, with their total flight time — for the status line and the
 * n-body panel.
 */
import type { FlownSpan } from '../../../core/integrate/index.ts';
import { integratorName } from '../../../core/io/index.ts';

export interface MethodGroup {
  method: string;
  /** Plain name: "RK45 (Dormand–Prince)", "Yoshida 4th-order symplectic" ... */
  label: string;
  reason: string;
  spans: number;
  /** Flight time in these spans, s. */
  seconds: number;
  fallback: boolean;
}

export function methodGroups(spans: readonly FlownSpan[]): MethodGroup[] {
  const out: MethodGroup[] = [];
  for (const s of spans) {
    // "RK45 failed: … at t=123; fell back …" differ in their numbers: group by the words.
    const key = s.reason.replace(/[-+]?\d[\d.e+-]*/g, '#');
    let g = out.find((x) => x.method === s.method && x.reason.replace(/[-+]?\d[\d.e+-]*/g, '#') === key);
    if (!g) {
      g = { method: s.method, label: integratorName(s.method), reason: s.reason, spans: 0, seconds: 0, fallback: s.method !== 'rk45' && s.method !== 'dop853' };
      out.push(g);
    }
    g.spans++;
    g.seconds += s.t1 - s.t0;
  }
  return out;
}

/** One line: "RK45 (Dormand–Prince) 8 spans" or "... · Yoshida 4th-order symplectic 2 spans (long coast: …)". */
export function methodSummary(spans: readonly FlownSpan[]): string {
  return methodGroups(spans)
    .map((g) => `${g.label} ${g.spans} span${g.spans === 1 ? '' : 's'}${g.reason === 'default' ? '' : ` (${g.reason})`}`)
    .join(' · ');
}
