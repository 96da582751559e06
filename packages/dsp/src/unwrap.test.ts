import { describe, expect, it } from 'vitest';
import { unwrapPhase, unwrapPhaseDeg } from './unwrap.ts';

describe('unwrapPhase', () => {
  it('gives numpy.unwrap’s values for a phase that wraps eight times on its way down', () => {
    // Made with numpy 2.4.6: np.random.seed(7); true = cumsum([0.3, uniform(-2.9, 0.4, 24)]);
    // wrapped = np.angle(np.exp(1j*true)); expected = np.unwrap(wrapped), rounded to 12 decimals.
    const wrapped = [
      0.3, -2.348182645066, -2.674450630674, 2.155485140261, 1.642920227103, 1.970285616692, 0.847321989046, -0.398980480876, -3.061211740789, 1.207822200727, -0.042565546549, -0.701106559349, -0.948767740205,
      -2.591662000815, 1.009113251154, -0.940006271129, -0.838347629655, -3.034175962841, 1.841018418337, 2.013998283311, -0.803834265773, -1.722022838142, -1.486595486776, 2.656589321172, 1.566606054651,
    ];
    const numpy = [
      0.3, -2.348182645066, -2.674450630674, -4.127700166919, -4.640265080077, -4.312899690488, -5.435863318133, -6.682165788055, -9.344397047968, -11.358548413632, -12.608936160908, -13.267477173709,
      -13.515138354564, -15.158032615174, -17.840442670385, -19.789562192668, -19.687903551193, -21.88373188438, -23.291722810381, -23.118742945408, -25.936575494491, -26.85476406686, -26.619336715495,
      -28.759337214726, -29.849320481247,
    ];
    const got = unwrapPhase(wrapped);
    numpy.forEach((v, i) => expect(got[i]).toBeCloseTo(v, 10));
  });

  it('treats steps of exactly ±π as numpy does: [0, π, 0, −π, 0, 3.5, −3] stays but for 3.5 → 3.5 − 2π', () => {
    // np.unwrap([0, π, 0, −π, 0, 3.5, −3.0]) = [0, π, 0, −π, 0, −2.7831853071795862, −3.0] (numpy 2.4.6)
    const got = unwrapPhase([0, Math.PI, 0, -Math.PI, 0, 3.5, -3.0]);
    expect(Array.from(got)).toEqual([0, Math.PI, 0, -Math.PI, 0, expect.closeTo(-2.7831853071795862, 14), -3.0]);
  });

  it('unwraps degrees: np.unwrap([170, −170, −150, 160, 175, −178], period=360) = [170, 190, 210, 160, 175, 182]', () => {
    const got = unwrapPhaseDeg([170, -170, -150, 160, 175, -178]);
    [170, 190, 210, 160, 175, 182].forEach((v, i) => expect(got[i]).toBeCloseTo(v, 10));
  });

  it('returns an empty array for no samples and refuses a sample that is not a number', () => {
    expect(unwrapPhase([])).toHaveLength(0);
    expect(() => unwrapPhase([0, Number.NaN])).toThrow(/phaseRad\[1\]=NaN/);
    expect(() => unwrapPhase([0], 0)).toThrow(/discont=0/);
  });
});
