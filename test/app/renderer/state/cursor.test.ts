import { describe, expect, it } from 'vitest';
import { CursorStore, type FrameClock } from '../../../../app/renderer/state/cursor.ts';

function manualClock() {
  let cb: ((now: number) => void) | null = null;
  const clock: FrameClock = {
    request: (f) => {
      cb = f;
      return 1;
    },
    cancel: () => {
      cb = null;
    },
  };
  return {
    clock,
    frame: (now: number) => {
      const f = cb;
      cb = null;
      f?.(now);
    },
  };
}

describe('time cursor', () => {
  it('clamps to the flown span and steps', () => {
    const c = new CursorStore(manualClock().clock);
    c.setSpan(100, 200);
    expect(c.get().t).toBe(100);
    c.set(500);
    expect(c.get().t).toBe(200);
    c.step(-30);
    expect(c.get().t).toBe(170);
    c.set(Number.NaN);
    expect(c.get().t).toBe(170);
  });

  it('keeps its place when a new result covers it, else goes to the start', () => {
    const c = new CursorStore(manualClock().clock);
    c.setSpan(0, 100);
    c.set(50);
    c.setSpan(0, 120);
    expect(c.get().t).toBe(50);
    c.setSpan(60, 120);
    expect(c.get().t).toBe(60);
  });

  it('plays at the chosen speed and stops at the end', () => {
    const { clock, frame } = manualClock();
    const c = new CursorStore(clock);
    c.setSpan(0, 10_000);
    c.setSpeed(1000); // simulated s per real s
    c.play();
    frame(0);
    frame(2000); // 2 s later
    expect(c.get().t).toBeCloseTo(2000, 9);
    expect(c.get().playing).toBe(true);
    frame(20_000);
    expect(c.get().t).toBe(10_000);
    expect(c.get().playing).toBe(false);
  });

  it('pauses', () => {
    const { clock, frame } = manualClock();
    const c = new CursorStore(clock);
    c.setSpan(0, 100);
    c.setSpeed(1);
    c.toggle();
    frame(0);
    c.toggle();
    frame(5000);
    expect(c.get().t).toBe(0);
    expect(c.get().playing).toBe(false);
  });
});
