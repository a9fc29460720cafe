/**
 * The Δv map (core/survey deltaVMap) drawn as a standalone, printable SVG of the product's own
 * design: each planet a family of vertical ladders (the planet, then its moons, left → right by
 * orbit radius), each ladder's rungs its SOI edge (top), low orbit and surface (bottom), the Δv
 * up and down written beside each segment; transfers run as rails from each low orbit, the
 * transfers between families as brackets above the ladders and those within a family below,
 * nested by span; a legend and the map's rules as a footnote. Every edge is a
 * `<g data-edge="id" data-dv="m/s">` holding its figure and a `<title>` with its `how` (the
 * native hover tooltip). Pure string building; the same map and options give the same bytes.
 * Layout: greedy interval placement of the bracket labels by span, the classic nested-interval
 * (interval graph colouring) rule, common practice.
 */
import type { DeltaVMap, MapEdge, MapNode, MapNodeKind } from '../survey/index.ts';
import type { StarSystem } from '../system/index.ts';

/** A body as the layout needs it: its parent among the drawn bodies (null for a planet of the star) and its orbit radius. */
export interface MapLayoutBody {
  id: string;
  /** Parent body id when the parent is drawn too (a moon's planet); null for the star's planets. */
  parent: string | null;
  /** Semi-major axis about the parent, m (orders the columns). */
  a: number;
}

export interface DeltaVMapSvgOptions {
  /** 'paper' (light, for print and export; the default) or 'screen' (the app's dark palette). */
  theme?: 'paper' | 'screen';
  /** Show the aerobraked figures (marked with the aero glyph) beside the plain ones. */
  aero?: boolean;
  /** Title at the top; default "Δv map — <system>". */
  title?: string;
  /** The bodies' hierarchy and orbit radii (mapLayoutBodies(system)); without it every body is its own column, in map order. */
  bodies?: readonly MapLayoutBody[];
}

/** The hierarchy the layout needs, from the system: planets of the star and their moons with their semi-major axes. */
export function mapLayoutBodies(system: StarSystem): MapLayoutBody[] {
  const out: MapLayoutBody[] = [];
  for (const b of system.bodies) {
    if (b.parentIndex < 0) continue;
    const parent = system.bodies[b.parentIndex];
    out.push({ id: b.id, parent: parent.parentIndex < 0 ? null : parent.id, a: b.elements?.a ?? 0 });
  }
  return out;
}

// ---------------------------------------------------------------------------------------------
// Layout

/** One line of text: position (left end, baseline), size, and the edge it belongs to. */
export interface LayoutLine {
  text: string;
  x: number;
  y: number;
  size: number;
  bold?: boolean;
  tone: 'ink' | 'muted' | 'aero' | 'path';
  /** The edge whose figure this line shows. */
  edge?: string;
  /** The aerobraked figure, drawn after the aero glyph in a column of the block at `aeroX`. */
  aero?: string;
  aeroX?: number;
}

/** A block of lines and its box (x, y top, w, h): what must not overlap another block. */
export interface LayoutBlock {
  x: number;
  y: number;
  w: number;
  h: number;
  lines: LayoutLine[];
  /** Draw a background under the block (it may sit over a rail). */
  halo?: boolean;
}

export interface LayoutLadder {
  body: string;
  name: string;
  moon: boolean;
  /** The ladder's line, x. */
  x: number;
  /** The rail's x (transfers leave the low orbit along it). */
  railX: number;
  rungs: { node: MapNode; y: number }[];
  /** Rail extent: from the low orbit up to `railTop` and down to `railBottom` (equal to the low orbit's y when unused). */
  railTop: number;
  railBottom: number;
  lowY: number;
}

export interface LayoutLink {
  /** The brackets' horizontal line: y, and the two rails' x. */
  y: number;
  x0: number;
  x1: number;
  edges: string[];
}

export interface DeltaVMapLayout {
  width: number;
  height: number;
  families: { x: number; y: number; w: number; h: number }[];
  ladders: LayoutLadder[];
  links: LayoutLink[];
  blocks: LayoutBlock[];
  /** Legend symbols: where to draw each (x, y centre). */
  legend: { kind: 'rung-soi' | 'rung-low' | 'rung-surface' | 'transfer' | 'glyph'; x: number; y: number }[];
}

const NNBSP = '\u202f';
const TEXT = 11;
const SMALL = 10;
const LINE = 14;
/** Estimated advance per character as a fraction of the font size: DejaVu Sans digits are 0.636 em and its lower case narrower, the widest of the stack's likely fallbacks (common practice: size for the widest font). */
const EM_NORMAL = 0.58;
const EM_BOLD = 0.64;
const GLYPH_W = 12;
const MARGIN = 24;
const SEG_H = 80;
const RAIL_DX = 14;
const FAMILY_GAP = 34;
const NAME_H = 34;

/** Estimated width of a line of text, px. */
export function textWidth(text: string, size: number, bold = false): number {
  return [...text].length * size * (bold ? EM_BOLD : EM_NORMAL);
}

/** Gap between a line's text and its block's aerobraked column, px. */
const AERO_GAP = 10;

function mainWidth(l: Omit<LayoutLine, 'x' | 'y'>): number {
  return textWidth(l.text, l.size, l.bold);
}

function grouped(int: string): string {
  let g = '';
  for (let i = 0; i < int.length; i++) {
    if (i > 0 && (int.length - i) % 3 === 0) g += NNBSP;
    g += int[i];
  }
  return g;
}

/** Δv in words: "850 m/s" below 1 km/s, "5.12 km/s" above (thousands grouped with a narrow space); "—" when not finite. */
export function dvWords(mps: number): string {
  if (!Number.isFinite(mps)) return '—';
  const a = Math.abs(mps);
  const sign = mps < 0 && a >= 0.5 ? '\u2212' : '';
  if (Math.round(a) < 1000) return `${sign}${Math.round(a)} m/s`;
  const [int, frac] = (a / 1000).toFixed(2).split('.');
  return `${sign}${grouped(int)}.${frac} km/s`;
}

const RUNG_ORDER: Record<MapNodeKind, number> = { 'soi-edge': 0, 'low-orbit': 1, surface: 2 };

/** Lines stacked from `y`; the aerobraked figures in a column after the widest text. */
function block(x: number, y: number, lines: Omit<LayoutLine, 'x' | 'y'>[], halo = false): LayoutBlock {
  const textW = lines.reduce((m, l) => Math.max(m, mainWidth(l)), 0);
  const aeroW = lines.reduce((m, l) => (l.aero === undefined ? m : Math.max(m, GLYPH_W + textWidth(l.aero, l.size))), 0);
  const aeroX = x + textW + AERO_GAP;
  const out: LayoutLine[] = lines.map((l, k) => ({ ...l, x, y: y + (k + 1) * LINE - 3, ...(l.aero === undefined ? {} : { aeroX }) }));
  return { x, y, w: aeroW > 0 ? textW + AERO_GAP + aeroW : textW, h: lines.length * LINE, lines: out, halo };
}

function moveBlock(b: LayoutBlock, x: number, y: number): LayoutBlock {
  const dx = x - b.x;
  const dy = y - b.y;
  return { ...b, x, y, lines: b.lines.map((l) => ({ ...l, x: l.x + dx, y: l.y + dy, ...(l.aeroX === undefined ? {} : { aeroX: l.aeroX + dx }) })) };
}

export function overlaps(a: { x: number; y: number; w: number; h: number }, b: { x: number; y: number; w: number; h: number }): boolean {
  return a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h;
}

/** The figure line of one edge: its Δv, and its aerobraked Δv beside it when asked and there is one. */
function edgeLines(e: MapEdge, head: string, aero: boolean): Omit<LayoutLine, 'x' | 'y'>[] {
  return [{ text: `${head}${dvWords(e.dv)}`, size: TEXT, tone: 'ink', edge: e.id, ...(aero && e.dvAero !== null ? { aero: dvWords(e.dvAero) } : {}) }];
}

interface Family {
  planet: string;
  members: string[];
}

/** Families of bodies (a planet and its moons), ordered by orbit radius; bodies the hierarchy does not know become families of their own. */
function families(map: DeltaVMap, bodies: readonly MapLayoutBody[] | undefined): Family[] {
  const order: string[] = [];
  for (const n of map.nodes) if (!order.includes(n.bodyId)) order.push(n.bodyId);
  const known = new Map((bodies ?? []).map((b) => [b.id, b]));
  const radius = (id: string) => known.get(id)?.a ?? 0;
  const rank = (id: string) => order.indexOf(id);
  const byOrbit = (p: string, q: string) => radius(p) - radius(q) || rank(p) - rank(q);
  const top = (id: string): string => {
    let cur = id;
    for (let k = 0; k < 8; k++) {
      const p = known.get(cur)?.parent;
      if (!p || !order.includes(p)) return cur;
      cur = p;
    }
    return cur;
  };
  const fam = new Map<string, string[]>();
  for (const id of order) {
    const t = top(id);
    if (!fam.has(t)) fam.set(t, []);
    if (id !== t) fam.get(t)?.push(id);
  }
  return [...fam.keys()].sort(byOrbit).map((p) => ({ planet: p, members: [p, ...(fam.get(p) ?? []).sort(byOrbit)] }));
}

interface Pair {
  a: string;
  b: string;
  edges: MapEdge[];
}

/** Lays the map out: every text block placed so that no two overlap. */
export function deltaVMapLayout(map: DeltaVMap, options: DeltaVMapSvgOptions = {}): DeltaVMapLayout {
  const aero = options.aero === true;
  const fams = families(map, options.bodies);
  const nodesOf = new Map<string, MapNode[]>();
  for (const n of map.nodes) {
    if (!nodesOf.has(n.bodyId)) nodesOf.set(n.bodyId, []);
    nodesOf.get(n.bodyId)?.push(n);
  }
  const nodeById = new Map(map.nodes.map((n) => [n.id, n]));
  const edges = [...map.edges].sort((p, q) => (p.id < q.id ? -1 : p.id > q.id ? 1 : 0));
  const placed = new Set<string>();

  // ladder segments: edges between adjacent rungs of one body
  const segEdges = new Map<string, { up: MapEdge[]; down: MapEdge[] }>();
  for (const e of edges) {
    const f = nodeById.get(e.from);
    const t = nodeById.get(e.to);
    if (!f || !t || f.bodyId !== t.bodyId || e.kind === 'transfer') continue;
    const rf = RUNG_ORDER[f.kind];
    const rt = RUNG_ORDER[t.kind];
    if (Math.abs(rf - rt) !== 1) continue;
    const key = `${f.bodyId}|${Math.min(rf, rt)}`;
    if (!segEdges.has(key)) segEdges.set(key, { up: [], down: [] });
    segEdges.get(key)?.[rt < rf ? 'up' : 'down'].push(e);
    placed.add(e.id);
  }

  // ladders' widths from their widest text
  const blocks: LayoutBlock[] = [];
  const ladders: LayoutLadder[] = [];
  const famBoxes: DeltaVMapLayout['families'] = [];
  const ladderWidth = (body: string): number => {
    let w = textWidth(nodesOf.get(body)?.[0]?.bodyName ?? body, 13, true);
    for (const n of nodesOf.get(body) ?? []) w = Math.max(w, textWidth(n.label, SMALL) + 12);
    for (const [key, s] of segEdges) {
      if (!key.startsWith(`${body}|`)) continue;
      const b = block(
        0,
        0,
        [...s.up, ...s.down].flatMap((e) => edgeLines(e, '↑ ', aero)),
      );
      w = Math.max(w, b.w + 12);
    }
    return Math.ceil(w) + RAIL_DX + 18;
  };

  // transfers: pairs of bodies, split into between families (above) and within one (below)
  const famOf = new Map<string, number>();
  fams.forEach((f, k) => {
    for (const m of f.members) famOf.set(m, k);
  });
  const pairs = new Map<string, Pair>();
  for (const e of edges) {
    if (placed.has(e.id)) continue;
    const f = nodeById.get(e.from);
    const t = nodeById.get(e.to);
    if (!f || !t || f.bodyId === t.bodyId || f.kind !== 'low-orbit' || t.kind !== 'low-orbit') continue;
    const [a, b] = f.bodyId < t.bodyId ? [f.bodyId, t.bodyId] : [t.bodyId, f.bodyId];
    const key = `${a}|${b}`;
    if (!pairs.has(key)) pairs.set(key, { a, b, edges: [] });
    pairs.get(key)?.edges.push(e);
    placed.add(e.id);
  }
  const nameOf = (body: string) => nodesOf.get(body)?.[0]?.bodyName ?? body;

  // horizontal placement of the ladders
  const ladderIndex = new Map<string, number>();
  const ladderX: number[] = [];
  const ladderW: number[] = [];
  let x = MARGIN;
  fams.forEach((f, k) => {
    if (k > 0) x += FAMILY_GAP;
    const x0 = x;
    for (const m of f.members) {
      ladderIndex.set(m, ladderX.length);
      const w = ladderWidth(m);
      ladderX.push(x + RAIL_DX + 8);
      ladderW.push(w);
      x += w;
    }
    famBoxes.push({ x: x0, y: 0, w: x - x0, h: 0 });
  });
  const ladderOrder = fams.flatMap((f) => f.members);
  const railX = (body: string) => (ladderX[ladderIndex.get(body) ?? 0] ?? 0) - RAIL_DX;

  // bracket labels: two blocks per pair direction, nested by span (greedy by span, then left end)
  const pairBlocks = (p: Pair): Omit<LayoutLine, 'x' | 'y'>[] => {
    const ordered = [...p.edges].sort((e1, e2) => {
      const a1 = nodeById.get(e1.from)?.bodyId === p.a ? 0 : 1;
      const a2 = nodeById.get(e2.from)?.bodyId === p.a ? 0 : 1;
      return a1 - a2 || (e1.id < e2.id ? -1 : 1);
    });
    return ordered.flatMap((e) => edgeLines(e, `${nameOf(nodeById.get(e.from)?.bodyId ?? '')} → ${nameOf(nodeById.get(e.to)?.bodyId ?? '')}  `, aero));
  };
  const arrange = (list: Pair[]) => {
    const spans = list
      .map((p) => {
        const i = ladderIndex.get(p.a) ?? 0;
        const j = ladderIndex.get(p.b) ?? 0;
        return { p, lo: Math.min(i, j), hi: Math.max(i, j), lines: pairBlocks(p) };
      })
      .sort((s, t) => s.hi - s.lo - (t.hi - t.lo) || s.lo - t.lo || s.hi - t.hi);
    const out: { p: Pair; level: number; block: LayoutBlock; lo: number; hi: number }[] = [];
    for (const s of spans) {
      let level = 0;
      for (const o of out) if (o.lo >= s.lo && o.hi <= s.hi && (o.lo > s.lo || o.hi < s.hi)) level = Math.max(level, o.level + 1);
      const x0 = railX(ladderOrder[s.lo]);
      const x1 = railX(ladderOrder[s.hi]);
      const b0 = block(0, 0, s.lines, true);
      const bx = Math.max(MARGIN, (x0 + x1) / 2 - b0.w / 2);
      for (;;) {
        const trial = { x: bx - 4, y: level * 1000, w: b0.w + 8, h: 10 };
        // at one level, neither two labels side by side nor two brackets meeting at a rail (they would read as one line)
        const clash = out.some(
          (o) => o.level === level && (overlaps(trial, { x: o.block.x - 4, y: level * 1000, w: o.block.w + 8, h: 10 }) || (o.hi >= s.lo && o.lo <= s.hi)),
        );
        if (!clash) break;
        level++;
      }
      out.push({ p: s.p, level, block: moveBlock(b0, bx, 0), lo: s.lo, hi: s.hi });
    }
    return out;
  };
  const above = arrange([...pairs.values()].filter((p) => famOf.get(p.a) !== famOf.get(p.b)));
  const below = arrange([...pairs.values()].filter((p) => famOf.get(p.a) === famOf.get(p.b)));
  const levelsOf = (l: typeof above) => l.reduce((m, o) => Math.max(m, o.level + 1), 0);
  const levelH = (l: typeof above) => l.reduce((m, o) => Math.max(m, o.block.h), 0) + 16;
  const nAbove = levelsOf(above);
  const nBelow = levelsOf(below);
  const gapAbove = levelH(above);
  const gapBelow = levelH(below);

  // title
  const title = options.title ?? `Δv map — ${map.system}`;
  blocks.push(block(MARGIN, 10, [{ text: title, size: 15, bold: true, tone: 'ink' }]));
  const subtitle = `Every edge: Δv in the direction of its arrow; hover for how it was computed.${aero ? ' Aerobraked figures marked.' : ''}`;
  blocks.push(block(MARGIN, 30, [{ text: subtitle, size: SMALL, tone: 'muted' }]));
  const aboveTop = 62;
  const soiY = aboveTop + nAbove * gapAbove + NAME_H;
  const lowY = soiY + SEG_H;
  const surfaceY = lowY + SEG_H;
  const anySurface = map.nodes.some((n) => n.kind === 'surface');
  const ladderBottom = anySurface ? surfaceY : lowY;

  // ladders
  for (const body of ladderOrder) {
    const k = ladderIndex.get(body) ?? 0;
    const lx = ladderX[k];
    const ns = [...(nodesOf.get(body) ?? [])].sort((p, q) => RUNG_ORDER[p.kind] - RUNG_ORDER[q.kind]);
    const yOf = (kind: MapNodeKind) => (kind === 'soi-edge' ? soiY : kind === 'low-orbit' ? lowY : surfaceY);
    const moon = fams[famOf.get(body) ?? 0]?.planet !== body;
    blocks.push(block(lx - 6, soiY - NAME_H + 2, [{ text: nameOf(body), size: 13, bold: !moon, tone: 'ink' }]));
    for (const n of ns) blocks.push(block(lx + 10, yOf(n.kind) - LINE / 2 - 1, [{ text: n.label, size: SMALL, tone: 'muted' }]));
    for (const r of [0, 1]) {
      const s = segEdges.get(`${body}|${r}`);
      if (!s) continue;
      const lines = [...s.up.flatMap((e) => edgeLines(e, '↑ ', aero)), ...s.down.flatMap((e) => edgeLines(e, '↓ ', aero))];
      const y0 = r === 0 ? soiY : lowY;
      const b = block(lx + 10, y0 + SEG_H / 2 - (lines.length * LINE) / 2, lines);
      blocks.push(b);
    }
    ladders.push({
      body,
      name: nameOf(body),
      moon,
      x: lx,
      railX: lx - RAIL_DX,
      rungs: ns.map((n) => ({ node: n, y: yOf(n.kind) })),
      railTop: lowY,
      railBottom: lowY,
      lowY,
    });
  }

  // brackets
  const links: LayoutLink[] = [];
  const aboveBase = soiY - NAME_H - 6;
  for (const o of above) {
    const y = aboveBase - o.level * gapAbove;
    const b = moveBlock(o.block, o.block.x, y - 3 - o.block.h);
    blocks.push(b);
    links.push({ y, x0: railX(ladderOrder[o.lo]), x1: railX(ladderOrder[o.hi]), edges: o.p.edges.map((e) => e.id) });
    for (const id of [ladderOrder[o.lo], ladderOrder[o.hi]]) {
      const l = ladders[ladderIndex.get(id) ?? 0];
      l.railTop = Math.min(l.railTop, y);
    }
  }
  const belowBase = ladderBottom + 30;
  for (const o of below) {
    const y = belowBase + o.level * gapBelow;
    const b = moveBlock(o.block, o.block.x, y + 3);
    blocks.push(b);
    links.push({ y, x0: railX(ladderOrder[o.lo]), x1: railX(ladderOrder[o.hi]), edges: o.p.edges.map((e) => e.id) });
    for (const id of [ladderOrder[o.lo], ladderOrder[o.hi]]) {
      const l = ladders[ladderIndex.get(id) ?? 0];
      l.railBottom = Math.max(l.railBottom, y);
    }
  }
  let y = belowBase + Math.max(0, nBelow - 1) * gapBelow + (nBelow > 0 ? gapBelow : 0) + 10;
  for (const f of famBoxes) {
    f.y = soiY - NAME_H - 2;
    f.h = ladderBottom + 16 - f.y;
  }

  // edges no ladder or bracket shows (none for a map of the documented shape): listed
  const rest = edges.filter((e) => !placed.has(e.id));
  if (rest.length > 0) {
    const lines = rest.flatMap((e) => edgeLines(e, `${e.from} → ${e.to}  `, aero));
    const b = block(MARGIN, y, [{ text: 'Other edges', size: SMALL, bold: true, tone: 'ink' }, ...lines]);
    blocks.push(b);
    y += b.h + 10;
  }

  let width = Math.max(x + MARGIN, ...blocks.map((b) => b.x + b.w + MARGIN));

  // legend: symbols and words in a row (wrapping to the width)
  const legend: DeltaVMapLayout['legend'] = [];
  const items: { kind: DeltaVMapLayout['legend'][number]['kind'] | null; text: string }[] = [
    { kind: 'rung-soi', text: 'SOI edge' },
    { kind: 'rung-low', text: 'low orbit' },
    { kind: 'rung-surface', text: 'surface' },
    { kind: null, text: '↑ Δv up (ascent, escape)   ↓ Δv down (landing, capture)' },
    { kind: 'transfer', text: 'transfer, low orbit to low orbit: best window over one synodic period' },
  ];
  if (aero) items.push({ kind: 'glyph', text: 'with aerobraking at the arriving body' });
  let lx = MARGIN;
  y += 6;
  for (const it of items) {
    const sym = it.kind ? 22 : 0;
    const w = sym + textWidth(it.text, SMALL) + 18;
    if (lx + w > width - MARGIN && lx > MARGIN) {
      lx = MARGIN;
      y += LINE + 6;
    }
    if (it.kind) legend.push({ kind: it.kind, x: lx + 8, y: y + LINE / 2 });
    blocks.push(block(lx + sym, y, [{ text: it.text, size: SMALL, tone: 'muted' }]));
    lx += w;
  }
  y += LINE + 12;

  // footnote: the rules, wrapped to the width
  const maxChars = Math.max(40, Math.floor((width - 2 * MARGIN) / (SMALL * EM_NORMAL)));
  const foot: Omit<LayoutLine, 'x' | 'y'>[] = [];
  for (const r of map.rules) for (const w of wrap(`• ${r}`, maxChars)) foot.push({ text: w, size: SMALL, tone: 'muted' });
  if (foot.length > 0) {
    const b = block(MARGIN, y, foot);
    blocks.push(b);
    y += b.h;
  }
  width = Math.ceil(Math.max(width, ...blocks.map((b) => b.x + b.w + MARGIN)));
  return { width, height: Math.ceil(y + 16), families: famBoxes, ladders, links, blocks, legend };
}

/** Words wrapped into lines of at most `max` characters (a longer word stands alone). */
export function wrap(text: string, max: number): string[] {
  const out: string[] = [];
  let cur = '';
  for (const w of text.split(/\s+/)) {
    if (w === '') continue;
    if (cur !== '' && [...cur].length + 1 + [...w].length > max) {
      out.push(cur);
      cur = `  ${w}`;
    } else cur = cur === '' ? w : `${cur} ${w}`;
  }
  if (cur !== '') out.push(cur);
  return out;
}

// ---------------------------------------------------------------------------------------------
// Drawing

interface Palette {
  bg: string;
  family: string;
  ink: string;
  muted: string;
  rule: string;
  path: string;
  aero: string;
  node: string;
}

/** 'paper' for print; 'screen' the app's palette (app/renderer/styles/app.css: --panel, --panel-2, --chalk, --muted, --rule-2, --path, --soi). */
const PALETTES: Record<'paper' | 'screen', Palette> = {
  paper: { bg: '#ffffff', family: '#f3f5f4', ink: '#1b2326', muted: '#56625d', rule: '#9aa6a1', path: '#17805c', aero: '#1f6fb2', node: '#1b2326' },
  screen: { bg: '#151c1f', family: '#1a2326', ink: '#dfe6e1', muted: '#8c9b95', rule: '#33423e', path: '#6fdcae', aero: '#58c4f0', node: '#dfe6e1' },
};

const FONT = "'IBM Plex Sans', 'Source Sans 3', 'Segoe UI', 'Noto Sans', 'DejaVu Sans', system-ui, sans-serif";

/** Text for XML: the five entities escaped, control characters other than tab and newline dropped. */
export function xmlText(s: string): string {
  let out = '';
  for (const ch of s) {
    const c = ch.codePointAt(0) ?? 0;
    if (ch === '&') out += '&amp;';
    else if (ch === '<') out += '&lt;';
    else if (ch === '>') out += '&gt;';
    else if (ch === '"') out += '&quot;';
    else if (ch === "'") out += '&apos;';
    else if ((c < 0x20 && c !== 0x09 && c !== 0x0a) || c === 0xfffe || c === 0xffff) continue;
    else out += ch;
  }
  return out;
}

const n1 = (v: number): string => {
  const r = Math.round(v * 10) / 10;
  return Object.is(r, -0) ? '0' : String(r);
};

/** The aero glyph: a small shield facing down, its curved face toward the air (the product's own mark). */
function glyph(x: number, baseline: number, colour: string): string {
  const cx = x + 5;
  const cy = baseline - 5;
  return `<path d="M${n1(cx - 5)} ${n1(cy - 2)}h10a5 5 0 0 1 -10 0z" fill="${colour}"/><path d="M${n1(cx - 3)} ${n1(cy - 5)}h6" stroke="${colour}" stroke-width="1.2"/>`;
}

/** The Δv map as an SVG document (see the file's head). */
export function deltaVMapSvg(map: DeltaVMap, options: DeltaVMapSvgOptions = {}): string {
  const p = PALETTES[options.theme ?? 'paper'];
  const L = deltaVMapLayout(map, options);
  const edgeById = new Map(map.edges.map((e) => [e.id, e]));
  const out: string[] = [];
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${L.width} ${L.height}" width="${L.width}" height="${L.height}" font-family="${xmlText(FONT)}" data-map-system="${xmlText(map.system)}">`,
  );
  out.push(`<title>${xmlText(options.title ?? `Δv map — ${map.system}`)}</title>`);
  out.push(`<rect x="0" y="0" width="${L.width}" height="${L.height}" fill="${p.bg}"/>`);
  for (const f of L.families) out.push(`<rect x="${n1(f.x)}" y="${n1(f.y)}" width="${n1(f.w)}" height="${n1(f.h)}" rx="6" fill="${p.family}"/>`);
  // rails and ladders
  for (const l of L.ladders) {
    if (l.railTop < l.lowY || l.railBottom > l.lowY) {
      out.push(`<path d="M${n1(l.railX)} ${n1(l.railTop)}V${n1(l.railBottom)}" stroke="${p.path}" stroke-width="1.4" fill="none"/>`);
      out.push(`<path d="M${n1(l.railX)} ${n1(l.lowY)}H${n1(l.x)}" stroke="${p.path}" stroke-width="1.4"/>`);
    }
    const ys = l.rungs.map((r) => r.y);
    out.push(`<path d="M${n1(l.x)} ${n1(Math.min(...ys))}V${n1(Math.max(...ys))}" stroke="${p.rule}" stroke-width="2"/>`);
  }
  // brackets: a halo under each line where it crosses another rail, then the line
  for (const k of L.links) {
    const d = `M${n1(k.x0)} ${n1(k.y)}H${n1(k.x1)}`;
    out.push(`<path d="${d}" stroke="${p.bg}" stroke-width="5" fill="none"/>`);
    out.push(`<path d="${d}" stroke="${p.path}" stroke-width="1.4" fill="none"/>`);
    for (const xe of [k.x0, k.x1]) out.push(`<circle cx="${n1(xe)}" cy="${n1(k.y)}" r="2" fill="${p.path}"/>`);
  }
  // rungs
  for (const l of L.ladders) {
    for (const r of l.rungs) out.push(rung(r.node.kind, l.x, r.y, p));
  }
  // legend symbols
  for (const s of L.legend) {
    if (s.kind === 'transfer') out.push(`<path d="M${n1(s.x - 6)} ${n1(s.y)}h14" stroke="${p.path}" stroke-width="1.4"/>`);
    else if (s.kind === 'glyph') out.push(glyph(s.x - 4, s.y + 5, p.aero));
    else out.push(rung(s.kind === 'rung-soi' ? 'soi-edge' : s.kind === 'rung-low' ? 'low-orbit' : 'surface', s.x, s.y, p));
  }
  // text: each edge's lines in its own group with its title
  const tone = (t: LayoutLine['tone']) => (t === 'ink' ? p.ink : t === 'muted' ? p.muted : t === 'aero' ? p.aero : p.path);
  const lineSvg = (l: LayoutLine): string => {
    const main = `<text x="${n1(l.x)}" y="${n1(l.y)}" font-size="${l.size}"${l.bold ? ' font-weight="600"' : ''} fill="${tone(l.tone)}">${xmlText(l.text)}</text>`;
    if (l.aero === undefined || l.aeroX === undefined) return main;
    return `${main}${glyph(l.aeroX, l.y, p.aero)}<text x="${n1(l.aeroX + GLYPH_W)}" y="${n1(l.y)}" font-size="${l.size}" fill="${p.aero}">${xmlText(l.aero)}</text>`;
  };
  for (const b of L.blocks) {
    if (b.halo) out.push(`<rect x="${n1(b.x - 3)}" y="${n1(b.y)}" width="${n1(b.w + 6)}" height="${n1(b.h)}" rx="3" fill="${p.bg}" opacity="0.92"/>`);
    let k = 0;
    while (k < b.lines.length) {
      const id = b.lines[k].edge;
      if (id === undefined) {
        out.push(lineSvg(b.lines[k]));
        k++;
        continue;
      }
      const group: LayoutLine[] = [];
      while (k < b.lines.length && b.lines[k].edge === id) group.push(b.lines[k++]);
      const e = edgeById.get(id);
      const dv = e && Number.isFinite(e.dv) ? String(Math.round(e.dv)) : '';
      const aeroAttr = e && e.dvAero !== null && Number.isFinite(e.dvAero) ? ` data-dv-aero="${Math.round(e.dvAero)}"` : '';
      out.push(
        `<g data-edge="${xmlText(id)}" data-kind="${xmlText(e?.kind ?? '')}" data-dv="${dv}"${aeroAttr}><title>${xmlText(e?.how ?? '')}</title>${group.map(lineSvg).join('')}</g>`,
      );
    }
  }
  out.push('</svg>');
  return `${out.join('\n')}\n`;
}

function rung(kind: MapNodeKind, x: number, y: number, p: Palette): string {
  if (kind === 'soi-edge') return `<circle cx="${n1(x)}" cy="${n1(y)}" r="4.5" fill="${p.bg}" stroke="${p.node}" stroke-width="1.4" stroke-dasharray="2 1.6"/>`;
  if (kind === 'low-orbit') return `<circle cx="${n1(x)}" cy="${n1(y)}" r="4.5" fill="${p.node}"/>`;
  return `<path d="M${n1(x - 8)} ${n1(y)}h16" stroke="${p.node}" stroke-width="2.4"/><path d="M${n1(x - 6)} ${n1(y + 2)}l-3 4M${n1(x)} ${n1(y + 2)}l-3 4M${n1(x + 6)} ${n1(y + 2)}l-3 4" stroke="${p.node}" stroke-width="1"/>`;
}
