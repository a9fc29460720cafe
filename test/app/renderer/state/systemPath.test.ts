/**
 * The renderer's relative system paths against Node's own path module (node:path posix and
 * win32, an implementation this project did not write): the path from a plan's folder to its
 * system file, and naming it again from a plan saved elsewhere.
 */
import { posix, win32 } from 'node:path';
import { describe, expect, it } from 'vitest';
import { rebaseSystemPath, relativeFrom, resolveFrom } from '../../../../app/renderer/state/systemPath.ts';

const POSIX: [string, string][] = [
  ['/designs/plans/trip.plan.json', '/designs/systems/ilmar.system.json'],
  ['/designs/plans/trip.plan.json', '/designs/plans/ilmar.system.json'],
  ['/designs/plans/trip.plan.json', '/designs/plans/sys/deep/x.system.json'],
  ['/a/b/c/d/p.plan.json', '/x.system.json'],
  ['/p.plan.json', '/a/b/x.system.json'],
  ['/designs/plans/trip.plan.json', '/designs/plans2/x.system.json'],
];
const WINDOWS: [string, string][] = [
  ['C:\\Users\\u\\plans\\trip.plan.json', 'C:\\Users\\u\\systems\\ilmar.system.json'],
  ['c:\\Users\\u\\plans\\trip.plan.json', 'C:\\Users\\u\\plans\\sub\\x.system.json'],
];

describe('system paths relative to the plan file', () => {
  it.each(POSIX)('POSIX: from %s to %s as node:path does', (plan, system) => {
    const rel = relativeFrom(plan, system);
    expect(rel).toBe(posix.relative(posix.dirname(plan), system));
    expect(posix.resolve(posix.dirname(plan), rel!)).toBe(system);
  });

  it.each(WINDOWS)('Windows: from %s to %s as node:path does (written with /)', (plan, system) => {
    const rel = relativeFrom(plan, system);
    expect(rel).toBe(win32.relative(win32.dirname(plan), system).replaceAll('\\', '/'));
    expect(win32.resolve(win32.dirname(plan), rel!).toLowerCase()).toBe(system.toLowerCase());
  });

  it('no relative path between two Windows drives, or from a path that is not absolute', () => {
    expect(relativeFrom('C:\\p\\a.plan.json', 'D:\\s\\x.system.json')).toBeNull();
    expect(relativeFrom('a.plan.json', '/s/x.system.json')).toBeNull();
    expect(resolveFrom('a.plan.json', 'x.system.json')).toBeNull();
  });

  it.each([
    ['/designs/plans/trip.plan.json', '/designs/elsewhere/deep/trip.plan.json', '../systems/ilmar.system.json'],
    ['/designs/plans/trip.plan.json', '/designs/plans/copy.plan.json', '../systems/ilmar.system.json'],
    ['/designs/plans/trip.plan.json', '/archive/trip.plan.json', './ilmar.system.json'],
    ['/designs/plans/trip.plan.json', '/designs/trip.plan.json', 'sys/../ilmar.system.json'],
  ])('a plan saved from %s to %s names %s from its new folder', (from, to, rel) => {
    const target = posix.resolve(posix.dirname(from), rel);
    const moved = rebaseSystemPath(from, to, rel);
    expect(posix.resolve(posix.dirname(to), moved!)).toBe(target);
    expect(moved).toBe(posix.relative(posix.dirname(to), target));
  });
});
