/** Helpers shared by the benchmarks: timing with warm-up, and a plain-text table. */

/** Median wall time in ms of `fn` over `repeats` runs after `warmup` runs. */
export function timeMedian(fn: () => void, repeats = 5, warmup = 1): { median: number; p95: number; all: number[] } {
  for (let i = 0; i < warmup; i++) fn();
  const all: number[] = [];
  for (let i = 0; i < repeats; i++) {
    const t0 = performance.now();
    fn();
    all.push(performance.now() - t0);
  }
  const s = [...all].sort((a, b) => a - b);
  return { median: s[Math.floor(s.length / 2)], p95: s[Math.min(s.length - 1, Math.ceil(s.length * 0.95) - 1)], all };
}

/** Prints rows as an aligned table. */
export function printTable(header: string[], rows: (string | number)[][]): void {
  const cells = [header, ...rows.map((r) => r.map((c) => (typeof c === 'number' ? fmt(c) : c)))];
  const widths = header.map((_, i) => Math.max(...cells.map((r) => String(r[i] ?? '').length)));
  for (const [k, r] of cells.entries()) {
    console.log(`  ${r.map((c, i) => String(c).padEnd(widths[i])).join('  ')}`);
    if (k === 0) console.log(`  ${widths.map((w) => '-'.repeat(w)).join('  ')}`);
  }
}

export function fmt(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  const a = Math.abs(x);
  if (a !== 0 && (a < 1e-3 || a >= 1e7)) return x.toExponential(3);
  if (Number.isInteger(x)) return String(x);
  return x.toPrecision(4);
}

/** A bare semi-implicit Euler loop about one central body, local variables only: the cost floor of a game step. */
export function bareEuler(steps: number, h: number): number {
  const mu = 3e14;
  let x = 6.2e6,
    y = 0,
    z = 0;
  let vx = 0,
    vy = Math.sqrt(mu / 6.2e6),
    vz = 0;
  for (let k = 0; k < steps; k++) {
    const r2 = x * x + y * y + z * z;
    const f = -mu / (r2 * Math.sqrt(r2));
    vx += h * f * x;
    vy += h * f * y;
    vz += h * f * z;
    x += h * vx;
    y += h * vy;
    z += h * vz;
  }
  return x + y + z;
}
