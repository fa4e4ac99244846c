import { describe, expect, it } from 'vitest';
import { studentTCdf, studentTDensity, studentTQuantile } from '../../../../shared/engine/stats/student-t.js';
import { normalQuantile } from '../../../../shared/engine/stats/normal-quantile.js';
import { logGamma } from '../../../../shared/engine/stats/log-gamma.js';

const relative = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b);

describe('studentTQuantile', () => {
  it('matches the closed forms for df = 1, 2 and 4 to 1e-13 (Hill 1970, CACM 13:617; also Wikipedia "Student\'s t-distribution")', () => {
    // (p closer to 1/2 would make the df = 4 formula itself lose digits in acos near 1.)
    for (const p of [0.6, 0.75, 0.9, 0.95, 0.975, 0.99, 0.999, 0.999999, 1e-9, 0.025, 0.3]) {
      // df = 1 (Cauchy): tan(pi (p - 1/2)), written as -1/tan(pi p) in the tails where tan near
      // pi/2 would amplify the rounding of its argument.
      const tail = Math.min(p, 1 - p);
      const cauchy = tail < 0.25 ? Math.sign(p - 0.5) / Math.tan(Math.PI * tail) : Math.tan(Math.PI * (p - 0.5));
      expect(relative(studentTQuantile(p, 1), cauchy)).toBeLessThan(1e-13);
      // df = 2: (2p - 1) / sqrt(2 p (1 - p)).
      expect(relative(studentTQuantile(p, 2), (2 * p - 1) / Math.sqrt(2 * p * (1 - p)))).toBeLessThan(1e-13);
      // df = 4: 2 sign(p - 1/2) sqrt(q - 1), q = cos(acos(sqrt(alpha)) / 3) / sqrt(alpha), alpha = 4 p (1 - p).
      const alpha = 4 * p * (1 - p);
      const q = Math.cos(Math.acos(Math.sqrt(alpha)) / 3) / Math.sqrt(alpha);
      expect(relative(studentTQuantile(p, 4), Math.sign(p - 0.5) * 2 * Math.sqrt(q - 1))).toBeLessThan(1e-10);
    }
    // Near the centre: tan(pi (p - 1/2)) with p - 1/2 exact.
    for (const p of [0.5000001, 0.5 + 1e-12, 0.4999]) {
      expect(relative(studentTQuantile(p, 1), Math.tan(Math.PI * (p - 0.5)))).toBeLessThan(1e-13);
    }
  });

  it('matches SciPy 1.17.1 scipy.stats.t.ppf (an independent implementation, Boost) to 1e-12', () => {
    // [p, df, SciPy value], computed outside this code base.
    const cases: [number, number, number][] = [
      [0.975, 1, 12.706204736174694],
      [0.975, 2, 4.302652729749462],
      [0.975, 3, 3.1824463052837078],
      [0.975, 5, 2.5705818356363146],
      [0.975, 10, 2.228138851986274],
      [0.975, 16, 2.1199052992212546],
      [0.975, 30, 2.0422724563012378],
      [0.975, 48, 2.010634757624232],
      [0.975, 100, 1.9839715185235518],
      [0.975, 1000, 1.9623390808264083],
      [0.975, 14399, 1.9601287506531926],
      [0.95, 7, 1.8945786050900062],
      [0.995, 20, 2.8453397097861077],
      [0.9995, 60, 3.460200469196392],
      [0.75, 4, 0.7406970841126829],
      [0.6, 2.5, 0.2814595127485477],
      [0.999999, 3, 103.29946777942898],
      [0.975, 0.7, 36.611415031588656],
      [0.025, 12, -2.1788128296672293],
      [1e-10, 5, -156.82559270889433],
    ];
    for (const [p, df, expected] of cases) {
      expect(relative(studentTQuantile(p, df), expected), `p ${p}, df ${df}`).toBeLessThan(1e-12);
    }
  });

  it('agrees with printed tables to their 3 decimals (e.g. Fisher & Yates; t(0.975, 16) = 2.120 as used by Bland & Altman 1986)', () => {
    expect(studentTQuantile(0.975, 16).toFixed(3)).toBe('2.120');
    expect(studentTQuantile(0.975, 10).toFixed(3)).toBe('2.228');
    expect(studentTQuantile(0.995, 5).toFixed(3)).toBe('4.032');
    expect(studentTQuantile(0.95, 1).toFixed(3)).toBe('6.314');
    expect(studentTQuantile(0.975, 120).toFixed(3)).toBe('1.980');
  });

  it('stays accurate for very large df (mpmath 1.3.0 findroot on betainc at 40 digits, computed outside this code)', () => {
    // Above 1e5 df the continued fraction of the incomplete beta would lose ~eps*sqrt(df).
    const cases: [number, number][] = [
      [1e4, 1.9602012398906258778],
      [1e5, 1.9599877075346092587],
      [1e6, 1.9599663568141066553],
      [1e7, 1.9599642217672051104],
      [1e9, 1.9599639869123250887],
    ];
    for (const [df, expected] of cases) expect(relative(studentTQuantile(0.975, df), expected), `df ${df}`).toBeLessThan(1e-13);
    // Either side of the switch to the expansion, and far in the tail (mpmath 1.3.0, 40 digits).
    expect(relative(studentTQuantile(0.975, 9999.999), 1.9602012399143545)).toBeLessThan(1e-13); // SciPy 1.17.1
    expect(relative(-studentTQuantile(7.619853024160525e-24, 10000), 10.02530383633617896523)).toBeLessThan(1e-13);
    expect(relative(-studentTQuantile(9.86587645037698e-10, 2000), 6.02786062020567269603)).toBeLessThan(1e-13);
  });

  it('the normal quantile it starts from is exact too (normal 0.975 quantile 1.959963984540054, SciPy norm.ppf)', () => {
    expect(relative(normalQuantile(0.975), 1.959963984540054)).toBeLessThan(1e-15);
    expect(relative(normalQuantile(1e-10), -6.361340902404056)).toBeLessThan(1e-14);
    expect(relative(normalQuantile(0.5000001), 2.506628273311648e-7)).toBeLessThan(1e-14);
  });

  it('is antisymmetric and inverts the CDF', () => {
    for (const df of [1, 3.5, 9, 200]) {
      for (const p of [1e-6, 0.01, 0.2, 0.45]) {
        const t = studentTQuantile(p, df);
        // 1 - p is rounded, so compare relatively.
        expect(relative(studentTQuantile(1 - p, df), -t)).toBeLessThan(1e-9);
        expect(relative(studentTCdf(t, df), p)).toBeLessThan(1e-12);
      }
    }
  });

  it('handles the ends and invalid input', () => {
    expect(studentTQuantile(0, 5)).toBe(-Infinity);
    expect(studentTQuantile(1, 5)).toBe(Infinity);
    expect(studentTQuantile(0.5, 5)).toBe(0);
    expect(studentTQuantile(1.5, 5)).toBeNaN();
    expect(studentTQuantile(0.9, 0)).toBeNaN();
    expect(studentTQuantile(NaN, 5)).toBeNaN();
  });
});

describe('studentTCdf and studentTDensity', () => {
  it('match the closed-form CDF for df = 3 (Wikipedia "Student\'s t-distribution")', () => {
    for (const t of [-2.5, -0.4, 0.1, 1, 3.2, 12]) {
      const u = t / Math.sqrt(3);
      const exact = 0.5 + (u / (1 + u * u) + Math.atan(u)) / Math.PI;
      expect(relative(studentTCdf(t, 3), exact)).toBeLessThan(1e-13);
    }
  });

  it('match SciPy 1.17.1 scipy.stats.t.cdf to 1e-12', () => {
    const cases: [number, number, number][] = [
      [2.5, 3, 0.9561466764959672],
      [-1.3, 7.5, 0.11606338940780439],
      [10, 2, 0.9950737714883372],
      [-40, 4, 1.1670081613006339e-6],
      [0.3, 1000, 0.617880247916378],
    ];
    for (const [t, df, expected] of cases) expect(relative(studentTCdf(t, df), expected)).toBeLessThan(1e-12);
  });

  it('the density at 0 is Gamma((df+1)/2) / (sqrt(df pi) Gamma(df/2)); for df = 1 it is 1/pi', () => {
    expect(relative(studentTDensity(0, 1), 1 / Math.PI)).toBeLessThan(1e-14);
    // df = 2: 1 / (2 sqrt 2) (closed form).
    expect(relative(studentTDensity(0, 2), 1 / (2 * Math.SQRT2))).toBeLessThan(1e-14);
  });

  it('logGamma matches factorials and Gamma(1/2) = sqrt(pi)', () => {
    expect(relative(logGamma(5), Math.log(24))).toBeLessThan(1e-15);
    expect(relative(logGamma(21), Math.log(2432902008176640000))).toBeLessThan(1e-15);
    expect(relative(logGamma(0.5), 0.5 * Math.log(Math.PI))).toBeLessThan(1e-14);
  });
});

describe('Student t with infinite degrees of freedom', () => {
  it('is the standard normal (normal 0.975 quantile 1.959963984540054, SciPy norm.ppf)', () => {
    expect(relative(studentTQuantile(0.975, Infinity), 1.959963984540054)).toBeLessThan(1e-15);
    expect(relative(studentTCdf(-1, Infinity), 0.15865525393145707)).toBeLessThan(1e-14);
  });
});
