/**
 * The inputs every file fuzz case starts from: the demo system file, the demo plan files and
 * the hand-made sample plans, loaded once.
 */
import { readFileSync } from 'node:fs';
import { parseSystemFile } from '../../core/io/systemFile.ts';
import type { StarSystem } from '../../core/system/model.ts';
import type { Json } from './json.ts';

const ROOT = new URL('../../', import.meta.url);

let systemText: string | null = null;
let system: StarSystem | null = null;

export function demoSystemText(): string {
  systemText ??= readFileSync(new URL('assets/systems/ilmar.system.json', ROOT), 'utf8');
  return systemText;
}

export function demoSystemDoc(): Json {
  return JSON.parse(demoSystemText()) as Json;
}

/** The demo system, built once (callers must not change it). */
export function demoSystem(): StarSystem {
  system ??= parseSystemFile(demoSystemText()).system;
  return system;
}

export const DEMO_PLAN_FILES = ['tessel-to-ochre.plan.json', 'tessel-to-ochre-heavy.plan.json'];

export function demoPlanText(file: string): string {
  return readFileSync(new URL(`assets/plans/${file}`, ROOT), 'utf8');
}
