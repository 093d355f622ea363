import { describe, expect, it } from 'vitest';
import { poissonFromRatio, vpVsRatio } from '../../src/site/vsFromVp.js';

describe('vpVsRatio', () => {
  // Vp/Vs = sqrt((2 − 2ν)/(1 − 2ν)) (elasticity; SEG Wiki "VS/VP"), evaluated by hand:
  const table: [number, number][] = [
    [0, Math.SQRT2], // sqrt(2/1)
    [0.25, Math.sqrt(3)], // sqrt(1.5/0.5): the Poisson solid
    [1 / 3, 2], // sqrt((4/3)/(1/3))
    [0.45, Math.sqrt(1.1 / 0.1)], // 3.3166
    [0.49, Math.sqrt(1.02 / 0.02)], // 7.1414
  ];
  for (const [nu, ratio] of table) {
    it(`vpVsRatio(${nu.toFixed(3)}) is ${ratio.toFixed(4)}, and poissonFromRatio inverts it`, () => {
      expect(vpVsRatio(nu)).toBeCloseTo(ratio, 10);
      if (nu > 0) expect(poissonFromRatio(ratio)).toBeCloseTo(nu, 10);
    });
  }

  it('vpVsRatio near Vp 1500 m/s: ν 0.45 to 0.49 gives Vs from about 450 down to 210 m/s (SITE-CLASSES.md)', () => {
    expect(1500 / vpVsRatio(0.45)).toBeCloseTo(452.3, 1);
    expect(1500 / vpVsRatio(0.49)).toBeCloseTo(210.0, 1);
  });

  it('vpVsRatio rejects ν of 0.5 (a fluid: no shear waves) and negative ν', () => {
    expect(() => vpVsRatio(0.5)).toThrow(/below 0.5/);
    expect(() => vpVsRatio(-0.1)).toThrow(RangeError);
  });

  it('poissonFromRatio rejects a Vp/Vs of 1.3, below sqrt 2 (it would need ν < 0), naming the bound', () => {
    // ν = (r² − 2) / (2 (r² − 1)) = (1.69 − 2) / 1.38 = −0.22 for r = 1.3, by hand.
    expect(() => poissonFromRatio(1.3)).toThrow(/Vp\/Vs must be above sqrt\(2\) = 1\.414.*got 1\.3/);
  });
});
