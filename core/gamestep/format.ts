/** Number formatting for the game-step check's notes. */

export function fmtS(s: number): string {
  return s >= 1 ? `${Number(s.toPrecision(4))} s` : `${Number((s * 1000).toPrecision(4))} ms`;
}

export function fmtM(m: number): string {
  return m >= 1000 ? `${(m / 1000).toFixed(3)} km` : `${m.toFixed(3)} m`;
}
