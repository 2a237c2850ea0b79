import { describe, expect, it } from 'vitest';
import { runStartSchema } from '../protocol/run-requests';
import { parseWith } from '../validation/field-errors';
import { parseScenario } from './parse-scenario';
import { CHOICE_PARAMETERS, choiceText } from './choice-parameters';
import { boundText, catalogueEntry, catalogueEntryAt, catalogueNumber, fieldLabel, PARAMETER_CATALOGUE, PARAMETER_GROUP_TITLES, parameterName, rangeViolation } from './parameter-catalogue';
import { controllerSchema } from './scenario-schema';

/**
 * A scenario that sets every catalogued scenario field, so each can be pushed out of range in turn.
 * The sine term carries frequency, the pulse width, the decay rate.
 */
const everyField = () => ({
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'every field',
  joint: { inertia: 0.05, damping: 0.02, stiffness: 0.1, gearRatio: 2 },
  controller: { mode: 'pid', kp: 8, ki: 1, kd: 0.6, derivativeFilter: 0.002, samplePeriod: 0.001 },
  initial: { angle: 0.1, velocity: 0.2 },
  inputs: [
    { channel: 'reference', shape: 'sine', amplitude: 0.5, delay: 0.1, frequency: 3 },
    { channel: 'torque', shape: 'pulse', amplitude: 0.2, delay: 0.5, width: 0.1 },
    { channel: 'torque', shape: 'decay', amplitude: 0.1, rate: 2 },
  ],
  recordedInputs: [{ channel: 'torque', logId: 'log-1', signal: 'torque', hold: 'linear', delay: 0.01 }],
  horizon: 2,
  limits: { overshootPercent: 10, settlingTime: 1, steadyStateError: 0.01 },
  nonlinear: {
    torqueLimit: 2,
    coulombFriction: 0.03,
    staticFriction: 0.05,
    gravity: { mass: 0.3, arm: 0.15, offset: 1, acceleration: 9.8 },
    torqueOffset: 0.02,
    deadBand: 0.01,
    encoderCounts: 4096,
    noiseStdDev: 1e-4,
    noiseSeed: 7,
  },
});

/** Where each catalogue path sits in everyField() (input terms: the term that uses the field). */
const locate = (path: string): (string | number)[] => {
  const parts = path.split('.');
  if (parts[0] === 'recordedInputs[]') return ['recordedInputs', 0, parts[1]!];
  if (parts[0] !== 'inputs[]') return parts;
  const term = { amplitude: 0, delay: 0, frequency: 0, width: 1, rate: 2 }[parts[1]!]!;
  return ['inputs', term, parts[1]!];
};

const withValue = (path: (string | number)[], value: unknown) => {
  const doc = everyField() as Record<string | number, unknown>;
  let node = doc;
  for (const key of path.slice(0, -1)) node = node[key] as Record<string | number, unknown>;
  node[path[path.length - 1]!] = value;
  return doc;
};

const scenarioEntries = PARAMETER_CATALOGUE.filter((e) => !e.path.startsWith('run.'));

describe('the parameter catalogue', () => {
  it('has one entry per path, each with a symbol, label, unit field, a range and a reason for both ends', () => {
    expect(new Set(PARAMETER_CATALOGUE.map((e) => e.path)).size).toBe(PARAMETER_CATALOGUE.length);
    for (const e of PARAMETER_CATALOGUE) {
      expect(e.symbol.length, e.path).toBeGreaterThan(0);
      expect(e.label.length, e.path).toBeGreaterThan(0);
      expect(typeof e.unit, e.path).toBe('string');
      expect(e.min.value, e.path).toBeLessThan(e.max.value);
      expect(Number.isFinite(e.min.value) && Number.isFinite(e.max.value), e.path).toBe(true);
      expect(e.min.reason.length, e.path).toBeGreaterThan(15);
      expect(e.max.reason.length, e.path).toBeGreaterThan(15);
    }
  });

  it('the full scenario used below parses, so every refusal below is the pushed field’s', () => {
    expect(parseScenario(everyField())).toMatchObject({ ok: true });
  });

  // Every scenario number's schema comes from the catalogue: pushing any one past its catalogued
  // maximum is refused on that field with the catalogue's reason, and its maximum itself passes.
  it.each(scenarioEntries.map((e) => [e.path, e] as const))('%s: the schema enforces the catalogued range', (_path, e) => {
    const at = locate(e.path);
    const field = at.join('.');
    const over = e.integer ? e.max.value + 1 : e.max.value * 10;
    const refused = parseScenario(withValue(at, over));
    expect(refused.ok).toBe(false);
    if (refused.ok) return;
    expect(refused.errors).toContainEqual({ field, message: `${parameterName(e)} must be at most ${boundText(e, 'max')}: ${e.max.reason}` });
    // staticFriction must stay at least coulombFriction: push both to the maximum together.
    const atMax = e.path === 'nonlinear.coulombFriction' ? withValue(['nonlinear', 'staticFriction'], e.max.value) : everyField();
    let node = atMax as Record<string | number, unknown>;
    for (const key of at.slice(0, -1)) node = node[key] as Record<string | number, unknown>;
    node[at[at.length - 1]!] = e.max.value;
    expect(parseScenario(atMax).ok, JSON.stringify(parseScenario(atMax))).toBe(true);
  });

  it('refuses the gains that froze the server (1e308 with friction on), naming the field and the reason', () => {
    for (const gain of ['kd', 'ki', 'kp'] as const) {
      const doc = withValue(['controller', gain], 1e308);
      const parsed = parseScenario(doc);
      expect(parsed.ok).toBe(false);
      if (parsed.ok) continue;
      expect(parsed.errors).toEqual([{ field: `controller.${gain}`, message: expect.stringMatching(new RegExp(`^${gain} must be at most 1e\\d+ N·m.*: ${gain} above`)) }]);
    }
  });

  it('keeps the plain sign messages below a lower bound of zero (and for a positive floor when ≤ 0)', () => {
    expect(rangeViolation(catalogueEntry('joint.inertia'), 0)).toBe('inertia must be positive');
    expect(rangeViolation(catalogueEntry('controller.kd'), -1)).toBe('kd must be zero or more');
    expect(rangeViolation(catalogueEntry('controller.samplePeriod'), 0)).toBe('samplePeriod must be positive');
    expect(rangeViolation(catalogueEntry('controller.samplePeriod'), 1e-8)).toMatch(/^samplePeriod must be at least 1e-7 s: no drive samples faster than 10 MHz/);
    expect(rangeViolation(catalogueEntry('nonlinear.encoderCounts'), 1.5)).toBe('encoderCounts must be a whole number');
    expect(rangeViolation(catalogueEntry('initial.angle'), -2e5)).toMatch(/^angle must be at least -1e5 rad: /);
  });

  it('gives one error per field: a value breaking the sign rule is not also told the magnitude', () => {
    const parsed = parseScenario(withValue(['controller', 'samplePeriod'], -1));
    expect(parsed).toEqual({ ok: false, errors: [{ field: 'controller.samplePeriod', message: 'samplePeriod must be positive' }] });
  });

  it('catalogueNumber refuses NaN and Infinity with the finite message', () => {
    for (const x of [Number.NaN, Infinity, -Infinity, '1']) {
      const parsed = parseWith(catalogueNumber('controller.kd'), x);
      expect(parsed).toEqual({ ok: false, errors: [{ field: '', message: 'kd must be a finite number' }] });
    }
  });

  it('throws for a path that is not catalogued (a programming error, not input)', () => {
    expect(() => catalogueEntry('controller.kx')).toThrow(/no parameter "controller.kx"/);
  });

  it('bounds the live run’s output spacing from the catalogue too', () => {
    const start = (dt: number) => parseWith(runStartSchema, { scenarioId: 1, dt });
    expect(start(0.001).ok).toBe(true);
    expect(start(1e-6)).toMatchObject({ ok: false, errors: [{ field: 'dt', message: expect.stringMatching(/^dt must be at least 0.0005 s: /) }] });
    expect(start(1)).toMatchObject({ ok: false, errors: [{ field: 'dt', message: expect.stringMatching(/^dt must be at most 0.1 s: /) }] });
  });

  // The magnitudes are generous on purpose: the two ends of what Kinetwin is for must both pass.
  describe('accepts physical joints from micro-actuators to large industrial axes', () => {
    const joint = (j: object, c: object, extra: object = {}) => ({ ...everyField(), joint: j, controller: { mode: 'pid', ...c }, ...extra });

    it('a micro-actuator: rotor inertia 1e-10 kg·m² (a 6 mm coreless motor), µN·m gains, 10 µs loop', () => {
      const parsed = parseScenario(joint({ inertia: 1e-10, damping: 1e-9, stiffness: 0, gearRatio: 1 }, { kp: 1e-6, ki: 1e-5, kd: 1e-8, samplePeriod: 1e-5 }, { nonlinear: { coulombFriction: 1e-7 } }));
      expect(parsed.ok, JSON.stringify(parsed)).toBe(true);
    });

    it('a large axis: 1e6 kg·m² (a 20 t turntable), kp = J·ω² at 10 rad/s, kd for critical damping at 5 rad/s', () => {
      const parsed = parseScenario(
        joint({ inertia: 1e6, damping: 1e5, stiffness: 1e9, gearRatio: 1e4 }, { kp: 1e8, ki: 1e9, kd: 1e7, samplePeriod: 0.01 }, { nonlinear: { torqueLimit: 1e7, gravity: { mass: 2e4, arm: 5 } } }),
      );
      expect(parsed.ok, JSON.stringify(parsed)).toBe(true);
    });
  });

  describe('what the app reads from it', () => {
    it('marks exactly the plant physics as fittable by calibration', () => {
      const fittable = PARAMETER_CATALOGUE.filter((e) => e.fittable).map((e) => e.path);
      expect(fittable).toEqual(['joint.inertia', 'joint.damping', 'joint.stiffness', 'recordedInputs[].delay', 'nonlinear.coulombFriction', 'nonlinear.staticFriction', 'nonlinear.torqueOffset']);
    });

    it('marks the tuning form’s numbers as editable, nothing of limits, twin effects or run settings', () => {
      const editable = PARAMETER_CATALOGUE.filter((e) => e.editable);
      expect(editable.map((e) => e.path)).toContain('controller.kd');
      expect(editable.map((e) => e.path)).toContain('inputs[].rate');
      expect(editable.map((e) => e.group)).not.toContain('limits');
      expect(editable.map((e) => e.group)).not.toContain('nonlinear');
      expect(catalogueEntry('controller.samplePeriod').editable).toBe(false);
    });

    it('groups by the path’s block, the horizon with the initial state', () => {
      expect(catalogueEntry('horizon').group).toBe('initial');
      expect(catalogueEntry('inputs[].delay').group).toBe('inputs');
      expect(catalogueEntry('recordedInputs[].delay').group).toBe('inputs');
      expect(catalogueEntry('nonlinear.gravity.mass').group).toBe('nonlinear');
      for (const e of PARAMETER_CATALOGUE) expect(PARAMETER_GROUP_TITLES[e.group]).toBeTruthy();
    });

    it('finds the entry of an actual input term’s path, and none for text or unknown fields', () => {
      expect(catalogueEntryAt('inputs.12.amplitude')?.path).toBe('inputs[].amplitude');
      expect(catalogueEntryAt('recordedInputs.1.delay')?.path).toBe('recordedInputs[].delay');
      expect(catalogueEntryAt('joint.inertia')?.symbol).toBe('J');
      expect(catalogueEntryAt('controller.mode')).toBeUndefined();
      expect(catalogueEntryAt('inputs.x.amplitude')).toBeUndefined();
    });

    it('labels a field with its words and symbol', () => {
      expect(fieldLabel(catalogueEntry('joint.inertia'))).toBe('Inertia J');
      expect(fieldLabel(catalogueEntry('controller.kp'))).toBe('Proportional gain kp');
      expect(fieldLabel(catalogueEntry('controller.derivativeFilter'))).toBe('Derivative filter Tf');
      expect(fieldLabel({ label: 'Derivative on', symbol: '' })).toBe('Derivative on');
    });

    it('offers for each choice parameter exactly the values the schema accepts', () => {
      const controller = controllerSchema;
      for (const choice of CHOICE_PARAMETERS) {
        const key = choice.path.split('.')[1]!;
        for (const value of Object.keys(choice.choices)) {
          expect(controller.safeParse({ mode: 'pid', [key]: value }).success, `${choice.path} = ${value}`).toBe(true);
        }
        expect(controller.safeParse({ mode: 'pid', [key]: 'neither' }).success).toBe(false);
      }
      for (const choice of CHOICE_PARAMETERS) if (choice.after !== null) expect(catalogueEntry(choice.after).group).toBe(choice.group);
      expect(choiceText('controller.mode', 'pid')).toBe('PID loop');
      expect(choiceText('controller.mode', 'unknown')).toBe('unknown');
    });
  });
});
