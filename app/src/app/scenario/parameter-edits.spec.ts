import { catalogueEntry } from '@kinetwin/shared/scenario/parameter-catalogue';
import { EDITABLE_PARAMETERS } from './parameter-edits';

describe('EDITABLE_PARAMETERS', () => {
  it('lists the catalogue’s editable numbers outside the input terms, in catalogue order, with its labels and units', () => {
    expect(EDITABLE_PARAMETERS.map((p) => p.path)).toEqual([
      'joint.inertia',
      'joint.damping',
      'joint.stiffness',
      'joint.gearRatio',
      'controller.kp',
      'controller.ki',
      'controller.kd',
      'controller.derivativeFilter',
      'initial.angle',
      'initial.velocity',
      'horizon',
    ]);
    const kd = EDITABLE_PARAMETERS.find((p) => p.path === 'controller.kd')!;
    expect(kd).toEqual({ path: 'controller.kd', label: `${catalogueEntry('controller.kd').label} kd`, unit: 'N·m·s/rad' });
  });
});
