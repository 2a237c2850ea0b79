import { describe, expect, it } from 'vitest';
import { signalOfHeader, unitOfHeader } from './log-header';
import { ANGLE_UNITS, TIME_UNITS, TORQUE_UNITS, VELOCITY_UNITS } from './log-signals';

describe('signalOfHeader', () => {
  it.each([
    ['time', 'time'],
    ['Time [s]', 'time'],
    ['t_ms', 'time'],
    ['t', 'time'],
    ['timestamp', 'time'],
    ['Zeit (ms)', 'time'],
    ['angle', 'angle'],
    ['Position (deg)', 'angle'],
    ['theta_deg', 'angle'],
    ['enc_counts', 'angle'],
    ['q', 'angle'],
    ['Winkel [°]', 'angle'],
    ['velocity', 'velocity'],
    ['vel_deg/s', 'velocity'],
    ['omega [rad/s]', 'velocity'],
    ['speed', 'velocity'],
    ['qd', 'velocity'],
    ['setpoint', 'setpoint'],
    ['Set-point [deg]', 'setpoint'],
    ['target angle', 'setpoint'],
    ['angle_cmd', 'setpoint'],
    ['commanded position', 'setpoint'],
    ['theta_ref', 'setpoint'],
    ['torque', 'torque'],
    ['tau Nm', 'torque'],
    ['Motor torque (N·m)', 'torque'],
    ['effort', 'torque'],
    ['Drehmoment [Nm]', 'torque'],
  ])('%s → %s', (header, signal) => {
    expect(signalOfHeader(header)).toBe(signal);
  });

  it('names nothing for unrelated headers', () => {
    for (const h of ['temperature', 'current [A]', 'voltage', 'flags', '']) expect(signalOfHeader(h)).toBeNull();
  });
});

describe('unitOfHeader', () => {
  it('finds units in brackets, after _ and as the last word', () => {
    expect(unitOfHeader('time [ms]', TIME_UNITS)).toBe('ms');
    expect(unitOfHeader('t_ms', TIME_UNITS)).toBe('ms');
    expect(unitOfHeader('time (s)', TIME_UNITS)).toBe('s');
    expect(unitOfHeader('ms', TIME_UNITS)).toBe('ms');
    expect(unitOfHeader('angle [deg]', ANGLE_UNITS)).toBe('deg');
    expect(unitOfHeader('theta_deg', ANGLE_UNITS)).toBe('deg');
    expect(unitOfHeader('Winkel [°]', ANGLE_UNITS)).toBe('deg');
    expect(unitOfHeader('angle (rad)', ANGLE_UNITS)).toBe('rad');
    expect(unitOfHeader('enc_counts', ANGLE_UNITS)).toBe('counts');
    expect(unitOfHeader('vel_deg/s', VELOCITY_UNITS)).toBe('deg/s');
    expect(unitOfHeader('omega [rad/s]', VELOCITY_UNITS)).toBe('rad/s');
    expect(unitOfHeader('tau Nm', TORQUE_UNITS)).toBe('N·m');
    expect(unitOfHeader('torque (N·m)', TORQUE_UNITS)).toBe('N·m');
  });

  it('ignores a unit that does not fit the signal, and headers that name none', () => {
    expect(unitOfHeader('time [deg]', TIME_UNITS)).toBeNull();
    expect(unitOfHeader('angle', ANGLE_UNITS)).toBeNull();
    expect(unitOfHeader('velocity [mm/s]', VELOCITY_UNITS)).toBeNull();
  });
});
