/**
 * Renderer entry: picks the host (Electron or browser), opens the session on the demo plan and
 * mounts the app. The demo plan and the bundled star systems are compiled into the bundle.
 */
import { mount } from 'svelte';
import App from './App.svelte';
import config from '../../electron.config.ts';
import { evaluate } from '../../core/conic/index.ts';
import { createHost } from './host/index.ts';
import { Session } from './state/session.ts';
import { askUser, pendingQuestion } from './state/ask.ts';
import './styles/app.css';

const systemFiles = import.meta.glob('../../assets/systems/*.system.json', { query: '?raw', import: 'default', eager: true }) as Record<string, string>;
const planFiles = import.meta.glob('../../assets/plans/*.plan.json', { query: '?raw', import: 'default', eager: true }) as Record<string, string>;

const baseName = (p: string) => p.split('/').pop() ?? p;
const bundledSystems = Object.fromEntries(Object.entries(systemFiles).map(([p, text]) => [baseName(p), text]));
const demoName = baseName(config.files.demoPlan);
const demoEntry = Object.entries(planFiles).find(([p]) => baseName(p) === demoName) ?? Object.entries(planFiles)[0];

async function start(): Promise<void> {
  const host = createHost();
  const session = await Session.create({
    host,
    evaluate: (system, plan) => evaluate(system, plan),
    bundledSystems,
    demo: demoEntry ? { name: baseName(demoEntry[0]), text: demoEntry[1] } : null,
    ask: (q) => askUser(q),
    autosaveMs: config.files.autosaveIntervalMs,
  });
  host.onCommand((c) => void session.command(c));
  mount(App, { target: document.getElementById('app')!, props: { session, host, pendingQuestion } });
}

start().catch((err: unknown) => {
  const el = document.getElementById('app')!;
  el.textContent = `Waymark could not start: ${err instanceof Error ? err.message : String(err)}`;
  el.className = 'fatal';
});
