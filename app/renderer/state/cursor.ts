/**
 * The time cursor: one time (s from the epoch) shared by the System view, the Timeline and the
 * readouts, clamped to the flown plan's span; stepping, and playback at a chosen speed
 * (simulated seconds per real second) driven by requestAnimationFrame.
 */
import { Observable, type Readable } from './observable.ts';

export interface CursorState {
  t: number;
  t0: number;
  t1: number;
  playing: boolean;
  /** Simulated seconds per real second. */
  speed: number;
}

export interface FrameClock {
  request(cb: (now: number) => void): number;
  cancel(id: number): void;
}

const defaultClock: FrameClock = {
  request: (cb) => requestAnimationFrame(cb),
  cancel: (id) => cancelAnimationFrame(id),
};

export class CursorStore implements Readable<CursorState> {
  #out: Observable<CursorState>;
  #raf = 0;
  #last = 0;

  constructor(private readonly clock: FrameClock = defaultClock) {
    this.#out = new Observable<CursorState>({ t: 0, t0: 0, t1: 0, playing: false, speed: 86400 });
  }

  subscribe(listener: (s: CursorState) => void): () => void {
    return this.#out.subscribe(listener);
  }

  get(): CursorState {
    return this.#out.get();
  }

  /** A new span (a new result); keeps the cursor where it is when it still lies inside. */
  setSpan(t0: number, t1: number, resetTo?: number): void {
    const s = this.#out.get();
    const t = resetTo ?? (s.t >= t0 && s.t <= t1 && s.t1 > s.t0 ? s.t : t0);
    this.#out.set({ ...s, t0, t1, t: Math.min(t1, Math.max(t0, t)) });
  }

  set(t: number): void {
    const s = this.#out.get();
    if (!Number.isFinite(t)) return;
    const c = Math.min(s.t1, Math.max(s.t0, t));
    if (c === s.t) return;
    this.#out.set({ ...s, t: c });
  }

  step(dt: number): void {
    this.set(this.#out.get().t + dt);
  }

  setSpeed(speed: number): void {
    this.#out.set({ ...this.#out.get(), speed });
  }

  play(): void {
    const s = this.#out.get();
    if (s.playing) return;
    const t = s.t >= s.t1 ? s.t0 : s.t;
    this.#out.set({ ...s, t, playing: true });
    this.#last = -1;
    const tick = (now: number) => {
      const st = this.#out.get();
      if (!st.playing) return;
      if (this.#last >= 0) {
        const next = st.t + ((now - this.#last) / 1000) * st.speed;
        if (next >= st.t1) {
          this.#out.set({ ...st, t: st.t1, playing: false });
          return;
        }
        this.#out.set({ ...st, t: next });
      }
      this.#last = now;
      this.#raf = this.clock.request(tick);
    };
    this.#raf = this.clock.request(tick);
  }

  pause(): void {
    const s = this.#out.get();
    if (this.#raf) this.clock.cancel(this.#raf);
    this.#raf = 0;
    if (s.playing) this.#out.set({ ...s, playing: false });
  }

  toggle(): void {
    if (this.#out.get().playing) this.pause();
    else this.play();
  }
}
