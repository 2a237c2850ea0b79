import { readdirSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { twinAgainstClosedForm } from '../../shared/checks/closed-form-angle';
import { solveClosedForm } from '../../shared/closed-form';
import { parseScenarioText } from '../../shared/scenario/parse-scenario';
import { twinScenarioErrors } from '../../shared/twin/twin-scenario-errors';
import { checkLimits } from '../cli/limits-check';

// Every demo file the seed loads: valid, solvable, and a fair demonstration of the twin and the
// closed form agreeing on a linear scenario.
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
    const compared = twinAgainstClosedForm(parsed.value, { dt: 0.001 });
    if (!compared.ok) throw new Error(JSON.stringify(compared.errors));
    expect(compared.value.twinStop).toBeNull();
    expect(compared.value.relativeMaxError).toBeLessThan(1e-6);
  });
});
