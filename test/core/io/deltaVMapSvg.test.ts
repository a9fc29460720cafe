import { describe, expect, it } from 'vitest';
import { deltaVMapLayout, deltaVMapSvg, dvWords, overlaps, wrap, xmlText } from '../../../core/io/deltaVMapSvg.ts';
import { FIXTURE_BODIES, fixtureMap } from './deltaVMapFixture.ts';

/**
 * A strict well-formedness scan of the XML 1.0 subset an SVG writer produces (XML 1.0 §2.1,
 * §3.1): one root element, every start tag closed in order, attributes name="value" without a
 * raw `<` or `&` that is not an entity reference, text without raw `<`, and only the five
 * predefined entities or numeric references.
 */
function wellFormed(xml: string): { ok: true; elements: number } | { ok: false; why: string } {
  const stack: string[] = [];
  let roots = 0;
  let elements = 0;
  let i = 0;
  const entity = /^&(?:amp|lt|gt|quot|apos|#[0-9]+|#x[0-9a-fA-F]+);/;
  const checkText = (t: string): string | null => {
    for (let k = 0; k < t.length; k++) {
      if (t[k] === '<') return 'raw < in text';
      if (t[k] === '&' && !entity.test(t.slice(k))) return `bad entity at ${t.slice(k, k + 10)}`;
    }
    return null;
  };
  while (i < xml.length) {
    const lt = xml.indexOf('<', i);
    const text = lt < 0 ? xml.slice(i) : xml.slice(i, lt);
    const bad = checkText(text);
    if (bad) return { ok: false, why: bad };
    if (text.trim() !== '' && stack.length === 0) return { ok: false, why: 'text outside the root' };
    if (lt < 0) break;
    const gt = xml.indexOf('>', lt);
    if (gt < 0) return { ok: false, why: 'unclosed tag' };
    const tag = xml.slice(lt + 1, gt);
    i = gt + 1;
    if (tag.startsWith('/')) {
      const name = tag.slice(1).trim();
      if (stack.pop() !== name) return { ok: false, why: `</${name}> closes the wrong element` };
      continue;
    }
    const self = tag.endsWith('/');
    const body = self ? tag.slice(0, -1) : tag;
    const m = /^([A-Za-z_][\w.:-]*)((?:\s+[A-Za-z_][\w.:-]*="[^"<]*")*)\s*$/.exec(body);
    if (!m) return { ok: false, why: `malformed tag <${tag.slice(0, 40)}>` };
    const names = [...m[2].matchAll(/([A-Za-z_][\w.:-]*)="([^"]*)"/g)];
    const seen = new Set<string>();
    for (const [, n, v] of names) {
      if (seen.has(n)) return { ok: false, why: `attribute ${n} twice` };
      seen.add(n);
      const b = checkText(v);
      if (b) return { ok: false, why: `${n}: ${b}` };
    }
    if (stack.length === 0) roots++;
    elements++;
    if (!self) stack.push(m[1]);
  }
  if (stack.length > 0) return { ok: false, why: `unclosed <${stack.at(-1)}>` };
  if (roots !== 1) return { ok: false, why: `${roots} root elements` };
  return { ok: true, elements };
}

/** Text of XML with the five entities read back. */
function readEntities(s: string): string {
  return s.replace(/&(amp|lt|gt|quot|apos);/g, (_, e: string) => ({ amp: '&', lt: '<', gt: '>', quot: '"', apos: "'" })[e] ?? '');
}

/** Each `<g data-edge>` group: its id, data-dv, title and the text it shows. */
function edgeGroups(svg: string): { id: string; dv: string; title: string; text: string }[] {
  return [...svg.matchAll(/<g data-edge="([^"]*)"[^>]*data-dv="([^"]*)"[^>]*><title>([^<]*)<\/title>(.*?)<\/g>/g)].map((m) => ({
    id: readEntities(m[1]),
    dv: m[2],
    title: readEntities(m[3]),
    text: readEntities([...m[4].matchAll(/<text[^>]*>([^<]*)<\/text>/g)].map((t) => t[1]).join(' | ')),
  }));
}

const VARIANTS = [
  { theme: 'paper' as const, aero: false },
  { theme: 'paper' as const, aero: true },
  { theme: 'screen' as const, aero: false },
  { theme: 'screen' as const, aero: true },
];

describe('Δv map SVG', () => {
  it('Δv in words: m/s below 1 km/s, km/s with 2 decimals above, thousands grouped with a narrow space, no NaN', () => {
    expect(dvWords(850.4)).toBe('850 m/s');
    expect(dvWords(999.4)).toBe('999 m/s');
    // 999.6 rounds to 1000 m/s: shown in km/s
    expect(dvWords(999.6)).toBe('1.00 km/s');
    expect(dvWords(5123.4)).toBe('5.12 km/s');
    expect(dvWords(1_239_687)).toBe('1\u202f239.69 km/s');
    expect(dvWords(Number.NaN)).toBe('—');
    expect(dvWords(Number.POSITIVE_INFINITY)).toBe('—');
  });

  it('escapes text for XML and drops control characters', () => {
    expect(xmlText(`a<b>&"c'`)).toBe('a&lt;b&gt;&amp;&quot;c&apos;');
    expect(xmlText('x\u0001y\u000bz')).toBe('xyz');
  });

  it('wraps words within the width', () => {
    const lines = wrap('one two three four five six seven', 10);
    for (const l of lines) expect([...l].length).toBeLessThanOrEqual(10);
    expect(lines.join(' ').replace(/\s+/g, ' ')).toBe('one two three four five six seven');
  });

  for (const v of VARIANTS) {
    it(`is well-formed XML with a viewBox, width and height (${v.theme}, aero ${v.aero})`, () => {
      const svg = deltaVMapSvg(fixtureMap(), { ...v, bodies: FIXTURE_BODIES });
      const wf = wellFormed(svg);
      expect(wf).toMatchObject({ ok: true });
      const head = /^<svg xmlns="http:\/\/www\.w3\.org\/2000\/svg" viewBox="0 0 (\d+) (\d+)" width="(\d+)" height="(\d+)"/.exec(svg);
      expect(head).not.toBeNull();
      expect(head?.[1]).toBe(head?.[3]);
      expect(head?.[2]).toBe(head?.[4]);
      expect(svg).not.toMatch(/NaN|undefined|Infinity|null/);
    });
  }

  it('the scan itself refuses broken XML', () => {
    expect(wellFormed('<svg><g></svg>').ok).toBe(false);
    expect(wellFormed('<svg><text>a < b</text></svg>').ok).toBe(false);
    expect(wellFormed('<svg><text>a & b</text></svg>').ok).toBe(false);
    expect(wellFormed('<svg a="1" a="2"/>').ok).toBe(false);
    expect(wellFormed('<svg/><svg/>').ok).toBe(false);
    expect(wellFormed('<svg><text>a &amp; b</text></svg>').ok).toBe(true);
  });

  it('every edge appears once, with its Δv and its how as the title', () => {
    const map = fixtureMap();
    for (const aero of [false, true]) {
      const groups = edgeGroups(deltaVMapSvg(map, { aero, bodies: FIXTURE_BODIES }));
      expect(groups.map((g) => g.id).sort()).toEqual(map.edges.map((e) => e.id).sort());
      for (const e of map.edges) {
        const g = groups.find((x) => x.id === e.id);
        expect(g?.dv).toBe(String(Math.round(e.dv)));
        expect(g?.title).toBe(e.how);
        expect(g?.text).toContain(dvWords(e.dv));
        if (aero && e.dvAero !== null) expect(g?.text).toContain(dvWords(e.dvAero));
        else if (e.dvAero !== null) expect(g?.text).not.toContain(dvWords(e.dvAero));
      }
    }
  });

  it('shows hand-checked figures: a landing in m/s beside its aerobraked figure, a transfer in km/s with its bodies', () => {
    const groups = edgeGroups(deltaVMapSvg(fixtureMap(), { aero: true, bodies: FIXTURE_BODIES }));
    // Ash's capture: 830 m/s, aerobraked 60 m/s (fixture figures)
    expect(groups.find((g) => g.id === 'ash:soi-edge>ash:low-orbit')?.text).toBe('↓ 830 m/s | 60 m/s');
    // Ash → Eyot: 5120 + 311·2 = 5742 m/s
    expect(groups.find((g) => g.id === 'ash:low-orbit>eyot:low-orbit')?.text).toBe('Ash → Eyot  5.74 km/s');
    // Eyot → Ash: 5120 + 733·2 + 1 234 567 = 1 241 153 m/s
    expect(groups.find((g) => g.id === 'eyot:low-orbit>ash:low-orbit')?.text).toBe('Eyot → Ash  1\u202f241.15 km/s');
  });

  it('escapes the system name and the how text', () => {
    const svg = deltaVMapSvg(fixtureMap(), { bodies: FIXTURE_BODIES });
    expect(svg).toContain('Brin &amp; &lt;Co&gt;');
    expect(svg).toContain('&amp; &lt;drag&gt;');
    expect(svg).toContain('&quot;powered&quot;');
  });

  it('no two text blocks overlap, with and without the hierarchy, with and without aerobraking', () => {
    for (const bodies of [FIXTURE_BODIES, undefined]) {
      for (const aero of [false, true]) {
        const L = deltaVMapLayout(fixtureMap(), { aero, bodies });
        expect(L.blocks.length).toBeGreaterThan(20);
        for (let i = 0; i < L.blocks.length; i++) {
          const a = L.blocks[i];
          expect(a.x).toBeGreaterThanOrEqual(0);
          expect(a.x + a.w).toBeLessThanOrEqual(L.width);
          expect(a.y).toBeGreaterThanOrEqual(0);
          expect(a.y + a.h).toBeLessThanOrEqual(L.height);
          // each line inside its block: the block is where the text is drawn
          for (const l of a.lines) {
            expect(l.x).toBeGreaterThanOrEqual(a.x);
            expect(l.y).toBeGreaterThan(a.y);
            expect(l.y).toBeLessThanOrEqual(a.y + a.h);
          }
          for (let j = i + 1; j < L.blocks.length; j++) {
            const b = L.blocks[j];
            if (overlaps(a, b)) throw new Error(`"${a.lines[0]?.text}" overlaps "${b.lines[0]?.text}"`);
          }
        }
      }
    }
  });

  it('orders ladders as families: each planet by orbit radius, its moons after it', () => {
    const L = deltaVMapLayout(fixtureMap(), { bodies: FIXTURE_BODIES });
    expect(L.ladders.map((l) => l.body)).toEqual(['ash', 'brume', 'cinder', 'dross', 'eyot']);
    expect(L.ladders.map((l) => l.moon)).toEqual([false, false, true, true, false]);
    for (let k = 1; k < L.ladders.length; k++) expect(L.ladders[k].x).toBeGreaterThan(L.ladders[k - 1].x);
    // Brume has no surface: two rungs; the others three
    expect(L.ladders.map((l) => l.rungs.length)).toEqual([3, 2, 3, 3, 3]);
    // the family transfers (Brume ⇄ moons, moon ⇄ moon) run below the ladders, the planets' above
    const lowest = Math.max(...L.ladders.flatMap((l) => l.rungs.map((r) => r.y)));
    const highest = Math.min(...L.ladders.flatMap((l) => l.rungs.map((r) => r.y)));
    for (const k of L.links) {
      const family = k.edges.every((id) => /^(brume|cinder|dross):/.test(id) && />(brume|cinder|dross):/.test(id));
      if (family) expect(k.y).toBeGreaterThan(lowest);
      else expect(k.y).toBeLessThan(highest);
    }
    expect(L.links.length).toBe(3 + 3);
    // two brackets on one line never meet at a rail (they would read as one longer bracket)
    for (const a of L.links)
      for (const b of L.links)
        if (a !== b && a.y === b.y) expect(Math.max(a.x0, a.x1) < Math.min(b.x0, b.x1) || Math.max(b.x0, b.x1) < Math.min(a.x0, a.x1)).toBe(true);
  });

  it('is deterministic, and the themes differ only in colour', () => {
    const map = fixtureMap();
    const a = deltaVMapSvg(map, { theme: 'screen', bodies: FIXTURE_BODIES });
    expect(deltaVMapSvg(fixtureMap(), { theme: 'screen', bodies: FIXTURE_BODIES })).toBe(a);
    const b = deltaVMapSvg(map, { theme: 'paper', bodies: FIXTURE_BODIES });
    expect(a).toContain('fill="#151c1f"');
    expect(b).toContain('fill="#ffffff"');
    expect(a.replace(/#[0-9a-f]{6}/g, '#')).toBe(b.replace(/#[0-9a-f]{6}/g, '#'));
  });

  it('lists the rules as a footnote and names the title', () => {
    const svg = deltaVMapSvg(fixtureMap(), { title: 'Costs of travel', bodies: FIXTURE_BODIES });
    expect(svg).toContain('<title>Costs of travel</title>');
    expect(svg).toContain('• Low orbit: a circular orbit just above the air or the terrain.');
  });
});
