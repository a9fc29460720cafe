import { describe, expect, it } from 'vitest';
import type { WorkerLike } from '../../../../app/renderer/windows/porkchopClient.ts';
import type { FromWorker, ToWorker } from '../../../../app/renderer/windows/protocol.ts';
import { CalendarClient } from '../../../../app/renderer/survey/calendarClient.ts';
import { calendarPair, windowCalendar } from '../../../../core/survey/index.ts';
import { demoSystem } from '../../../core/search/fixtures.ts';

/** A worker that runs the calendar message in this thread, answering on a later turn (as a real one would). */
class FakeWorker implements WorkerLike {
  onmessage: ((e: MessageEvent<FromWorker>) => void) | null = null;
  received: ToWorker[] = [];
  terminated = false;
  postMessage(m: ToWorker): void {
    this.received.push(m);
    if (m.type !== 'calendar-pair') return;
    setTimeout(() => {
      try {
        const pair = calendarPair(m.system, m.request, m.pairIndex);
        this.onmessage?.({ data: { type: 'calendar-pair-done', id: m.id, pairIndex: m.pairIndex, pair, ms: 0 } } as MessageEvent<FromWorker>);
      } catch (err) {
        this.onmessage?.({ data: { type: 'error', id: m.id, message: (err as Error).message } } as MessageEvent<FromWorker>);
      }
    }, 0);
  }
  terminate(): void {
    this.terminated = true;
  }
}

const system = demoSystem();
const request = {
  years: 3,
  pairs: [
    { from: 'tessel', to: 'ochre' },
    { from: 'kiln', to: 'tessel' },
    { from: 'ochre', to: 'tessel' },
  ],
};

describe('calendar client', () => {
  it('shares the pairs between two workers, one at a time each, and assembles the core calendar in pair order', async () => {
    const fakes: FakeWorker[] = [];
    const client = new CalendarClient(() => {
      const w = new FakeWorker();
      fakes.push(w);
      return w;
    }, 2);
    const seen: number[] = [];
    const r = await client.run(system, request, (f) => seen.push(f));
    expect(r).not.toBeNull();
    expect(r!.workers).toBe(2);
    expect(fakes.length).toBe(2);
    // every pair sent once, over both workers
    const sent = fakes.flatMap((w) => w.received.filter((m) => m.type === 'calendar-pair').map((m) => (m as { pairIndex: number }).pairIndex));
    expect(sent.sort()).toEqual([0, 1, 2]);
    expect(fakes.every((w) => w.received.length > 0)).toBe(true);
    const expected = windowCalendar(system, request);
    expect(r!.calendar.pairs.map((p) => `${p.from}:${p.to}`)).toEqual(['tessel:ochre', 'kiln:tessel', 'ochre:tessel']);
    expect(r!.calendar).toEqual(expected);
    expect(seen[seen.length - 1]).toBe(1);
    client.dispose();
    expect(fakes.every((w) => w.terminated)).toBe(true);
  });

  it('resolves to null at once when cancelled and hands out no further pair', async () => {
    const fakes: FakeWorker[] = [];
    const client = new CalendarClient(() => {
      const w = new FakeWorker();
      fakes.push(w);
      return w;
    }, 1);
    const run = client.run(system, request, () => undefined);
    client.cancel();
    expect(await run).toBeNull();
    await new Promise((resolve) => setTimeout(resolve, 50));
    expect(fakes[0].received.length).toBe(1);
    client.dispose();
  });

  it('rejects a bad request before any work is sent', () => {
    const fakes: FakeWorker[] = [];
    const client = new CalendarClient(() => {
      const w = new FakeWorker();
      fakes.push(w);
      return w;
    }, 2);
    expect(() => client.run(system, { years: 0 }, () => undefined)).toThrow(/years/);
    expect(fakes.length).toBe(0);
  });
});
