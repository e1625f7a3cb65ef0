import { describe, expect, it } from 'vitest';
import {
  addComplex,
  complex,
  divideComplex,
  magnitudeComplex,
  multiplyComplex,
  phaseDegComplex,
  reciprocalComplex,
  solveComplexLinearSystem,
  subtractComplex,
} from '../../../shared/engine/complex';
import { hasNumpy, runPython } from '../../helpers/reference-tools';

/** Double precision over a 4×4 elimination with well-conditioned entries. */
const SOLVE_TOLERANCE = 1e-12;

describe('complex arithmetic', () => {
  it('adds, subtracts and multiplies as (1 + 2j) and (3 + 4j) do by hand', () => {
    // Hand arithmetic (common practice, no source).
    expect(addComplex(complex(1, 2), complex(3, 4))).toEqual({ re: 4, im: 6 });
    expect(subtractComplex(complex(1, 2), complex(3, 4))).toEqual({ re: -2, im: -2 });
    expect(multiplyComplex(complex(1, 2), complex(3, 4))).toEqual({ re: -5, im: 10 });
  });

  it('divides exactly where the result is representable, in both branches of Smith’s algorithm', () => {
    // By hand: (−5 + 10j)/(3 + 4j) = 1 + 2j, and (−5 + 10j)/(4 + 3j) = (−5 + 10j)(4 − 3j)/25 = (10 + 55j)/25.
    expect(divideComplex(complex(-5, 10), complex(3, 4))).toEqual({ re: 1, im: 2 });
    const other = divideComplex(complex(-5, 10), complex(4, 3));
    expect(other.re).toBeCloseTo(0.4, 15);
    expect(other.im).toBeCloseTo(2.2, 15);
  });

  it('keeps huge and tiny operands from overflowing in division and magnitude', () => {
    // Smith (1962): the naive formula would form 1e400 here.
    const quotient = divideComplex(complex(1e200, 1e200), complex(1e200, 1e200));
    expect(quotient.re).toBeCloseTo(1, 15);
    expect(quotient.im).toBeCloseTo(0, 15);
    expect(Math.abs(magnitudeComplex(complex(3e200, 4e200)) / 5e200 - 1)).toBeLessThan(1e-15);
  });

  it('gives 1/(2j) = −0.5j and the phase of j as 90 degrees', () => {
    expect(reciprocalComplex(complex(0, 2))).toEqual({ re: 0, im: -0.5 });
    expect(phaseDegComplex(complex(0, 1))).toBe(90);
  });
});

describe('solveComplexLinearSystem', () => {
  it('solves a one-by-one system', () => {
    expect(solveComplexLinearSystem([[complex(2)]], [complex(4, 2)])).toEqual([{ re: 2, im: 1 }]);
  });

  it.skipIf(!hasNumpy)('agrees with numpy.linalg.solve on a complex 4×4 system that needs pivoting', () => {
    const matrix = [
      [complex(0, 0), complex(2, 1), complex(-1, 0.5), complex(3, 0)],
      [complex(1, -1), complex(0.5, 0), complex(2, 2), complex(-1, 0)],
      [complex(4, 0), complex(-2, 1), complex(0, 1), complex(1, 1)],
      [complex(-1, 3), complex(1, 0), complex(0.25, -2), complex(2, -1)],
    ];
    const rightHandSide = [complex(1, 0), complex(0, 1), complex(-2, 0.5), complex(3, -3)];
    const expected = runPython<[number, number][]>(
      `
import json, sys, numpy as np
data = json.load(sys.stdin)
a = np.array([[complex(c['re'], c['im']) for c in row] for row in data['matrix']])
b = np.array([complex(c['re'], c['im']) for c in data['rhs']])
x = np.linalg.solve(a, b)
print(json.dumps([[v.real, v.imag] for v in x]))
`,
      { matrix, rhs: rightHandSide },
    );
    const solution = solveComplexLinearSystem(matrix, rightHandSide);
    solution.forEach((value, index) => {
      expect(Math.abs(value.re - expected[index][0])).toBeLessThan(SOLVE_TOLERANCE);
      expect(Math.abs(value.im - expected[index][1])).toBeLessThan(SOLVE_TOLERANCE);
    });
  });

  it('refuses a singular matrix and mismatched sizes', () => {
    expect(() =>
      solveComplexLinearSystem(
        [
          [complex(1), complex(2)],
          [complex(2), complex(4)],
        ],
        [complex(1), complex(1)],
      ),
    ).toThrowError(/singular/);
    expect(() => solveComplexLinearSystem([[complex(1), complex(2)]], [complex(1)])).toThrowError(/1×1 matrix/);
  });
});
