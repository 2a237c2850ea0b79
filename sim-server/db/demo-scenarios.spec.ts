import { readdirSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { twinAgainstClosedForm } from '../../shared/checks/closed-form-angle';
import { superpositionCheck } from '../../shared/checks/superposition-check';
import { solveClosedForm } from '../../shared/closed-form';
import { parseScenarioText } from '../../shared/scenario/parse-scenario';
import { twinScenarioErrors } from '../../shared/twin/twin-scenario-errors';
import { checkLimits } from '../cli/limits-check';

// Every demo file the seed loads: valid, solvable, and a fair demonstration of the twin and the
// closed form agreeing once the nonlinear effects are off.
const folder = new URL('../../scenarios/', import.meta.url);
const files = readdirSync(folder).filter((f) => f.endsWith('.json'));

describe.each(files)('demo scenario %s', (file) => {
  const parsed = parseScenarioText(readFileSync(new URL(file, folder), 'utf8'));

  it('is valid, says it is demo data, and the twin accepts it', () => {
    expect(parsed.ok, JSON.stringify(!parsed.ok && parsed.errors)).toBe(true);
    if (!parsed.ok) return;
    expect(parsed.value.notes).toMatch(/^DEMO DATA/);
    expect(twinScenarioErrors(parsed.value)).toEqual([]);
  });

  it('has a stable closed form that meets its own limits', () => {
    if (!parsed.ok) throw new Error('invalid');
    const solved = solveClosedForm(parsed.value);
    if (!solved.ok) throw new Error(JSON.stringify(solved.errors));
    expect(solved.value.stable).toBe(true);
    const limits = checkLimits(parsed.value.limits, solved.value.metrics, solved.value.metricsReason);
    expect(limits.filter((l) => !l.met)).toEqual([]);
  });

  it('agrees with the twin to 1e-6 of the peak with every effect off', () => {
    if (!parsed.ok) throw new Error('invalid');
    const compared = twinAgainstClosedForm({ ...parsed.value, nonlinear: {} }, { dt: 0.001 });
    if (!compared.ok) throw new Error(JSON.stringify(compared.errors));
    expect(compared.value.twinStop).toBeNull();
    expect(compared.value.relativeMaxError).toBeLessThan(1e-6);
  });
});

describe('the demo scenarios as a set', () => {
  const verdicts = files.map((file) => {
    const parsed = parseScenarioText(readFileSync(new URL(file, folder), 'utf8'));
    if (!parsed.ok) throw new Error(`${file} is invalid`);
    return { file, check: superpositionCheck(parsed.value) };
  });

  it('include one where the superposition check passes and one where a torque limit breaks it', () => {
    expect(verdicts.some((v) => v.check.pass)).toBe(true);
    const broken = verdicts.filter((v) => !v.check.pass);
    expect(broken.map((v) => v.file)).toEqual(['elbow-lift-drive-limit.json']);
    expect(broken[0]!.check.reason).toMatch(/^torque limit ±1\.5 N·m reached at t = 0\.200 s/);
  });
});
