import { describe, expect, it } from 'vitest';
import type { Flag } from '../../../../core/plan/result.ts';
import type { TruthReport } from '../../../../core/target/index.ts';
import { PATH_FLAGS, planFlags } from '../../../../app/renderer/target/planFlags.ts';

const flag = (code: Flag['code'], severity: Flag['severity'], message: string): Flag => ({ code, severity, message, planEventId: null });
const missed = flag('target-missed', 'error', 'target orbit about Ochre not reached: the ship ends about Ilmar');
const atmosphere = flag('atmosphere-entry', 'warning', "the ship descends below Ochre's safe altitude");
const longBurn = flag('long-burn', 'warning', 'Ochre capture: lasts 9.0 % of the orbital period');
const dry = flag('out-of-propellant', 'error', 'Apoapsis trim: out of propellant');

/**
 * A truth report with only what the flags read: its model, its words, its flight's flags and its
 * failures, and the burns of its budget (`unflown`: rows of burns its patched-conic reading never reached).
 */
function report(model: TruthReport['model'], flags: Flag[], failures: string[], unflown: { planEventId: string; flags: Flag[] }[] = []): TruthReport {
  return {
    model,
    label: model === 'nbody' ? 'n-body' : 'patched conics, every burn finite',
    conic: { flags, budget: { rows: [] } },
    budget: { rows: unflown },
    failures,
  } as unknown as TruthReport;
}

describe("the Budget's flags of the plan in its truth model", () => {
  it('in patched conics: every flag of the evaluation, no comparison', () => {
    const f = planFlags({ truthModel: 'conic', source: 'evaluation' }, { flags: [missed, longBurn] }, null);
    expect(f).toEqual({ label: 'patched conics', problems: [], flags: [missed, longBurn], comparison: null });
  });

  it("in n-body: the report's failures are the problems; the patched-conic path's miss and atmosphere entry only the comparison's", () => {
    const evaluation = { flags: [missed, atmosphere, longBurn] };
    const f = planFlags({ truthModel: 'nbody', source: 'truth' }, evaluation, report('nbody', [missed, atmosphere, longBurn], []));
    expect(f.label).toBe('n-body');
    expect(f.problems).toEqual([]);
    expect(f.flags).toEqual([longBurn]);
    expect(f.comparison).toEqual({ label: 'patched conics', flags: [missed, atmosphere] });
    for (const x of f.flags) expect(PATH_FLAGS.has(x.code)).toBe(false);
  });

  it('in n-body, a plan that fails there: the failures in its words, no error flag repeated', () => {
    const failures = ['Apoapsis trim: out of propellant', 'the n-body flight hits Ochre on day 402.90'];
    const f = planFlags({ truthModel: 'nbody', source: 'stale' }, { flags: [dry, longBurn] }, report('nbody', [dry, longBurn], failures));
    expect(f.problems).toEqual(failures);
    expect(f.flags).toEqual([longBurn]);
    expect(f.comparison).toBeNull();
  });

  it('in n-body, a burn the patched-conic reading never reached (it hit a body first): its flags from the schedule budget', () => {
    const ranDry = { ...flag('stage-dry-mid-burn', 'warning', 'Capture: Cruise stage ran dry during the burn'), planEventId: 'capture' };
    const short = { ...flag('out-of-propellant', 'error', 'Capture: out of propellant, 12.0 m/s of 900.0 m/s not delivered'), planEventId: 'capture' };
    const r = report('nbody', [longBurn], [short.message], [{ planEventId: 'capture', flags: [ranDry, short] }]);
    const f = planFlags({ truthModel: 'nbody', source: 'truth' }, { flags: [longBurn] }, r);
    // the error is the report's failure (problems), the warning the plan's own flag, neither a comparison
    expect(f.problems).toEqual([short.message]);
    expect(f.flags).toEqual([longBurn, ranDry]);
    expect(f.comparison).toBeNull();
  });

  it("with finite burns: the finite flight's own flags are the plan's, the impulsive evaluation's differing ones the comparison's", () => {
    const capture = flag('long-burn', 'warning', 'Ochre capture: lasts 12.0 % of the orbital period');
    const f = planFlags(
      { truthModel: 'finite', source: 'truth' },
      { flags: [longBurn] },
      report('finite', [atmosphere, capture, missed], ['periapsis altitude about Ochre is 2000.250 km, wanted 400.000 km ± 10.000 km']),
    );
    expect(f.problems).toHaveLength(1);
    expect(f.flags).toEqual([atmosphere, capture]);
    expect(f.comparison).toEqual({ label: 'patched conics', flags: [longBurn] });
  });

  it("while the model's flight is computed (or failed): no problems claimed, the path flags as the comparison", () => {
    for (const source of ['pending', 'failed'] as const) {
      const f = planFlags({ truthModel: 'nbody', source }, { flags: [missed, longBurn] }, null);
      expect(f.problems).toEqual([]);
      expect(f.flags).toEqual([longBurn]);
      expect(f.comparison).toEqual({ label: 'patched conics', flags: [missed] });
    }
  });
});
