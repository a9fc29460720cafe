import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ValidationError } from '../../../core/math/errors.ts';
import { OEM_DIGITS, formatOemEpoch, parseOem, parseOemEpoch, writeOem } from '../../../core/io/oem.ts';
import { sampleEphemeris } from '../../../core/conic/ephemerisSampler.ts';
import { TESSEL, ilmar, syntheticResult } from './syntheticResult.ts';

const eph = sampleEphemeris(ilmar, syntheticResult(), { step: 700 });
const text = writeOem(ilmar, eph, { objectName: 'Long Patience', creationDate: '2030-05-06T07:08:09', spanComments: [['burn "kick" at t = 4000 s']] });
const lines = text.split('\n');

function issues(t: string): string[] {
  try {
    parseOem(t);
  } catch (e) {
    expect(e).toBeInstanceOf(ValidationError);
    return (e as ValidationError).issues.map((i) => `${i.path}: ${i.rule}`);
  }
  throw new Error('parsed but should not have');
}

describe('OEM epochs', () => {
  it('t = 0 is the nominal origin 2000-01-01T00:00:00', () => {
    expect(formatOemEpoch(0)).toBe('2000-01-01T00:00:00.000000');
    expect(formatOemEpoch(1.5)).toBe('2000-01-01T00:00:01.500000');
    expect(formatOemEpoch(-1)).toBe('1999-12-31T23:59:59.000000');
  });

  it('follows the Gregorian calendar: 2000 is a leap year (common practice)', () => {
    expect(formatOemEpoch(59 * 86400)).toBe('2000-02-29T00:00:00.000000');
    expect(formatOemEpoch(366 * 86400)).toBe('2001-01-01T00:00:00.000000');
    expect(parseOemEpoch('2000-060T00:00:00')).toBe(59 * 86400);
    expect(parseOemEpoch('2001-02-29T00:00:00')).toBeNull();
    expect(parseOemEpoch('2100-02-29T00:00:00')).toBeNull();
  });

  it('property: agrees with JavaScript Date (an independent calendar) and reads back within 0.5 µs', () => {
    const origin = Date.UTC(2000, 0, 1);
    fc.assert(
      fc.property(fc.double({ min: -5e10, max: 2e11, noNaN: true }), (t) => {
        const s = formatOemEpoch(t);
        const micro = Math.round((t - Math.floor(t)) * 1e6);
        const whole = Math.floor(t) + (micro === 1e6 ? 1 : 0);
        const iso = new Date(origin + whole * 1000).toISOString();
        const isoYear = iso.startsWith('+') || iso.startsWith('-') ? iso.slice(3) : iso; // ±YYYYYY form for far years
        expect(s.slice(0, 19)).toBe(isoYear.slice(0, 19));
        expect(Math.abs(parseOemEpoch(s)! - t)).toBeLessThanOrEqual(5e-7 + Math.abs(t) * 2.3e-16);
      }),
      { numRuns: 1000 },
    );
  });

  it('reads both calendar and day-of-year forms, with or without a trailing Z', () => {
    expect(parseOemEpoch('2000-01-02T03:04:05.25Z')).toBe(86400 + 3 * 3600 + 4 * 60 + 5.25);
    expect(parseOemEpoch('2000-002T03:04:05.25')).toBe(86400 + 3 * 3600 + 4 * 60 + 5.25);
    expect(parseOemEpoch('2000-13-01T00:00:00')).toBeNull();
    expect(parseOemEpoch('2000-01-01 00:00:00')).toBeNull();
  });
});

describe('writeOem: structure per CCSDS 502.0-B-2 (header, metadata blocks, data lines)', () => {
  it('header: version 2.0 first, then comments, CREATION_DATE and ORIGINATOR', () => {
    expect(lines[0]).toMatch(/^CCSDS_OEM_VERS\s+= 2\.0$/);
    const header = lines.slice(0, lines.indexOf('META_START'));
    expect(header.filter((l) => l.startsWith('COMMENT')).length).toBeGreaterThanOrEqual(3);
    expect(header).toContain('CREATION_DATE        = 2030-05-06T07:08:09');
    expect(header).toContain('ORIGINATOR           = WAYMARK');
    expect(header.some((l) => /COMMENT Epochs: system time t = 0 \(Year 412 TR, day 1, 00:00\) is written 2000-01-01T00:00:00/.test(l))).toBe(true);
  });

  it('one metadata block per central-body span, with the required keywords in the standard order', () => {
    const starts = lines.flatMap((l, k) => (l === 'META_START' ? [k] : []));
    expect(starts.length).toBe(eph.spans.length);
    const order = ['OBJECT_NAME', 'OBJECT_ID', 'CENTER_NAME', 'REF_FRAME', 'TIME_SYSTEM', 'START_TIME', 'USEABLE_START_TIME', 'USEABLE_STOP_TIME', 'STOP_TIME'];
    const centres: string[] = [];
    for (const s of starts) {
      const stop = lines.indexOf('META_STOP', s);
      const block = lines.slice(s + 1, stop).filter((l) => !l.startsWith('COMMENT'));
      expect(block.map((l) => l.split(/\s*=/)[0])).toEqual(order);
      centres.push(block[2].split('= ')[1]);
      expect(block[3]).toMatch(/= ICRF$/);
      expect(block[4]).toMatch(/= TDB$/);
    }
    expect(centres).toEqual(['TESSEL', 'ILMAR']);
    expect(lines).toContain('COMMENT burn "kick" at t = 4000 s');
    expect(lines).toContain('OBJECT_ID            = LONG-PATIENCE');
  });

  it('data lines: an epoch and six numbers in km and km/s with the documented decimals', () => {
    const data = lines.filter((l) => /^\d{4}-\d{2}-\d{2}T/.test(l));
    expect(data.length).toBe(eph.spans.reduce((n, s) => n + s.t.length, 0));
    const re = new RegExp(
      `^\\d{4}-\\d{2}-\\d{2}T\\d{2}:\\d{2}:\\d{2}\\.\\d{6}( -?\\d+\\.\\d{${OEM_DIGITS.position}}){3}( -?\\d+\\.\\d{${OEM_DIGITS.velocity}}){3}$`,
    );
    for (const l of data) expect(l).toMatch(re);
    // The first state is the circular parking orbit: x = R0 = 6300 km, vy = √(μ/R0).
    const first = data[0].split(' ');
    expect(first[1]).toBe('6300.000000');
    expect(Number(first[5])).toBeCloseTo(Math.sqrt(ilmar.bodies[TESSEL].mu / 6.3e6) / 1e3, 9);
  });

  it('parsed back: the same epochs and states within the printed precision', () => {
    const msg = parseOem(text);
    expect(msg.version).toBe('2.0');
    expect(msg.originator).toBe('WAYMARK');
    expect(msg.segments.length).toBe(eph.spans.length);
    msg.segments.forEach((seg, k) => {
      const span = eph.spans[k];
      expect(seg.metadata.CENTER_NAME).toBe(ilmar.bodies[span.center].name.toUpperCase());
      expect(seg.t.length).toBe(span.t.length);
      for (let j = 0; j < span.t.length; j++) {
        expect(Math.abs(seg.t[j] - span.t[j])).toBeLessThan(5e-7 + 1e-9);
        for (let c = 0; c < 3; c++) {
          // 1 mm printed: half of it, plus the rounding of a 1e11 m value.
          expect(Math.abs(seg.states[6 * j + c] - span.states[6 * j + c])).toBeLessThanOrEqual(5e-4 + 1e-4);
          expect(Math.abs(seg.states[6 * j + 3 + c] - span.states[6 * j + 3 + c])).toBeLessThanOrEqual(5e-7 + 1e-9);
        }
      }
    });
  });

  it('refuses empty input and bad dates', () => {
    expect(() => writeOem(ilmar, { step: 1, spans: [] }, { objectName: 'x', creationDate: '2030-01-01T00:00:00' })).toThrow(/no samples/);
    expect(() => writeOem(ilmar, eph, { objectName: 'x', creationDate: 'yesterday' })).toThrow(/creationDate/);
    expect(() => formatOemEpoch(1e12)).toThrow(/years 1 to 9999/);
  });
});

describe('parseOem', () => {
  // Laid out like the OEM example of CCSDS 502.0-B-2 (from memory), with invented values.
  const example = [
    'CCSDS_OEM_VERS = 2.0',
    'CREATION_DATE = 2010-03-12T22:31:12.000',
    'ORIGINATOR = TEST',
    '',
    'META_START',
    'OBJECT_NAME = TEST PROBE',
    'OBJECT_ID = 2010-001A',
    'CENTER_NAME = EARTH',
    'REF_FRAME = EME2000',
    'TIME_SYSTEM = UTC',
    'START_TIME = 2010-03-12T00:00:00.000',
    'USEABLE_START_TIME = 2010-03-12T00:00:00.000',
    'USEABLE_STOP_TIME = 2010-03-12T00:02:00.000',
    'STOP_TIME = 2010-03-12T00:02:00.000',
    'INTERPOLATION = HERMITE',
    'INTERPOLATION_DEGREE = 7',
    'META_STOP',
    '',
    'COMMENT Produced for a parser test.',
    '2010-03-12T00:00:00.000 2789.6 -280.0 -1746.7 4.73 -2.49 -1.04',
    '2010-03-12T00:01:00.000 2783.4 -308.1 -1877.0 5.18 -2.42 -1.99 0.001 0.002 0.003',
    '2010-071T00:02:00.000 2776.0 -336.8 -2008.6 5.63 -2.33 -1.94',
    '',
  ].join('\n');

  it('reads the standard layout, including accelerations and day-of-year epochs', () => {
    const m = parseOem(example);
    expect(m.creationDate).toBe('2010-03-12T22:31:12.000');
    expect(m.segments.length).toBe(1);
    const s = m.segments[0];
    expect(s.metadata.REF_FRAME).toBe('EME2000');
    expect(s.metadata.INTERPOLATION_DEGREE).toBe('7');
    expect(s.comments).toEqual(['Produced for a parser test.']);
    expect(s.t[1] - s.t[0]).toBe(60);
    expect(s.t[2] - s.t[0]).toBe(120);
    expect(Array.from(s.states.slice(0, 6))).toEqual([2789.6, -280.0, -1746.7, 4.73, -2.49, -1.04].map((x) => x * 1e3));
    expect(s.states.length).toBe(18);
  });

  const broken: [string, (t: string) => string, RegExp][] = [
    ['a first line that is not the version', (t) => t.replace('CCSDS_OEM_VERS = 2.0', 'CCSDS_OPM_VERS = 2.0'), /^line 1: must be CCSDS_OEM_VERS/],
    ['a missing ORIGINATOR', (t) => t.replace('ORIGINATOR = TEST\n', ''), /needs ORIGINATOR/],
    ['a missing required metadata keyword', (t) => t.replace('CENTER_NAME = EARTH\n', ''), /^line 5: the metadata block needs CENTER_NAME$/],
    ['an unknown metadata keyword', (t) => t.replace('TIME_SYSTEM = UTC', 'TIME_SYSTEM = UTC\nSPEED = 3'), /unknown metadata keyword SPEED/],
    ['a data line with five numbers', (t) => t.replace(' -1.04\n', '\n'), /^line 20: a data line must have an epoch and 6 numbers/],
    ['a number that is not one', (t) => t.replace('4.73', '4,73'), /value 4 must be a number/],
    ['epochs out of order', (t) => t.replace('2010-071T00:02:00.000', '2010-03-12T00:00:30.000'), /epochs must increase/],
    ['a bad epoch', (t) => t.replace('2010-03-12T00:01:00.000', '2010-03-32T00:01:00.000'), /the epoch must be/],
    ['META_STOP missing', (t) => t.replace('META_STOP\n', ''), /META_STOP|metadata block/],
    ['data after STOP_TIME', (t) => t.replace(/^STOP_TIME = .*$/m, 'STOP_TIME = 2010-03-12T00:01:30.000'), /has data after STOP_TIME/],
    ['a covariance section', (t) => `${t}COVARIANCE_START\nEPOCH = 2010-03-12T00:00:00\nCOVARIANCE_STOP\n`, /covariance sections are not supported/],
    ['a comment after data lines', (t) => t.replace('2010-071T', 'COMMENT late\n2010-071T'), /COMMENT is allowed only before the first data line/],
  ];
  for (const [name, edit, want] of broken) {
    it(`rejects ${name}`, () => {
      const got = issues(edit(example));
      expect(
        got.some((g) => want.test(g)),
        got.join('\n'),
      ).toBe(true);
    });
  }
});
