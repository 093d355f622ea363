import { describe, expect, it } from 'vitest';
import { formatSe, seDecimals } from '../../src/core/units.js';
import { Figures } from '../../src/report/html/figures.js';
import { plusMinus } from '../../src/report/format.js';
import { velocity } from '../../web/src/format.js';
import { run } from '../cli/run.js';

// "± 0" reads as exact; a standard error of 0.3 m/s rounded to whole units is not zero (common
// practice of reporting: an uncertainty is given to at least one significant figure).
describe('a standard error that rounds to zero is printed with the digits it needs', () => {
  it('formatSe(0.3, 0) is "0.3", formatSe(0.04, 0) "0.04", formatSe(0.004, 0) "< 0.01", formatSe(2.4, 0) "2", formatSe(0, 0) "0"', () => {
    expect(formatSe(0.3, 0)).toBe('0.3');
    expect(formatSe(0.04, 0)).toBe('0.04');
    expect(formatSe(0.004, 0)).toBe('< 0.01');
    expect(formatSe(2.4, 0)).toBe('2');
    expect(formatSe(0.0004, 2)).toBe('0.0004');
    expect(formatSe(0, 0)).toBe('0');
    expect(seDecimals(0.3, 0)).toBe(1);
    expect(plusMinus(450, 0.3, 0)).toBe('450 ± 0.3');
    expect(plusMinus(3.98, 0.004, 2)).toBe('3.98 ± 0.004');
  });

  it('site --layer 4:185:0.3 prints 185 ± 0.3 in the profile and the Vs table, and never "± 0"; in feet 0.4 ft/s prints 0.4', () => {
    const metres = run(['site', '--layer', '4:185:0.3', '--layer', '10:430:0.4', '--halfspace', '880:0.2']);
    expect(metres.code).toBe(0);
    expect(metres.stdout).toMatch(/layer 1: 4\.00 m at 185 m\/s ± 0\.3/);
    expect(metres.stdout).toMatch(/^ +1 +185 ± 0\.3 +measured/m);
    expect(metres.stdout).not.toMatch(/± 0(?![.\d])/);
    // The same profile in feet (1 ft = 0.3048 m): 880 m/s = 2887 ft/s, given an SE of 0.4 ft/s.
    const feet = run(['site', '--units', 'ft', '--layer', '13.123:607:0.98', '--layer', '32.808:1411:1.3', '--halfspace', '2887:0.4']);
    expect(feet.code).toBe(0);
    expect(feet.stdout).toMatch(/half-space at 2887 ft\/s ± 0\.4/);
    expect(feet.stdout).not.toMatch(/± 0(?![.\d])/);
  });

  it('the report gives a standard error of 0.3 m/s its decimal (Figures.pm), and the app its velocity text', () => {
    const fig = new Figures({ layers: [{ velocity_mps: 1500.2, velocity_se_mps: 0.3 }, { velocity_mps: 3000, velocity_se_mps: 12.4 }] });
    expect(fig.pm('layers.0.velocity_mps', 'layers.0.velocity_se_mps', 0).replace(/<[^>]+>/g, '')).toBe('1500 ± 0.3');
    expect(fig.pm('layers.1.velocity_mps', 'layers.1.velocity_se_mps', 0).replace(/<[^>]+>/g, '')).toBe('3000 ± 12');
    expect(velocity(1500.2, 0.3, 'm')).toBe('1500 ± 0.3 m/s');
    expect(velocity(1500.2, 0.3, 'ft')).toBe('4922 ± 1 ft/s');
    expect(velocity(1500.2, 0.1, 'ft')).toBe('4922 ± 0.3 ft/s');
  });
});
