// Small complex arithmetic for circuit predictions (phasors at one frequency).
// Values are plain immutable objects; each operation returns a new one. The
// solvers here handle a handful of nodes, so clarity wins over allocation.

/** A complex number `re + j·im`. */
export interface Complex {
  readonly re: number;
  readonly im: number;
}

/** `re + j·im`. Example: complex(1, 2) → { re: 1, im: 2 }. */
export function complex(re: number, im = 0): Complex {
  return { re, im };
}

/** Zero and one, shared. */
export const COMPLEX_ZERO: Complex = Object.freeze({ re: 0, im: 0 });
export const COMPLEX_ONE: Complex = Object.freeze({ re: 1, im: 0 });

/** a + b. Example: addComplex(complex(1, 2), complex(3, 4)) → 4 + 6j. */
export function addComplex(a: Complex, b: Complex): Complex {
  return { re: a.re + b.re, im: a.im + b.im };
}

/** a − b. Example: subtractComplex(complex(1, 2), complex(3, 4)) → −2 − 2j. */
export function subtractComplex(a: Complex, b: Complex): Complex {
  return { re: a.re - b.re, im: a.im - b.im };
}

/** a · b. Example: multiplyComplex(complex(1, 2), complex(3, 4)) → −5 + 10j. */
export function multiplyComplex(a: Complex, b: Complex): Complex {
  return { re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re };
}

/** a · k for a real k. Example: scaleComplex(complex(1, 2), 3) → 3 + 6j. */
export function scaleComplex(a: Complex, factor: number): Complex {
  return { re: a.re * factor, im: a.im * factor };
}

/**
 * a / b, by Smith's algorithm (R. L. Smith, "Algorithm 116: Complex division",
 * CACM 1962) so that neither part overflows for large or small operands.
 * Division by zero gives non-finite parts, as real division does.
 * Example: divideComplex(complex(-5, 10), complex(3, 4)) → 1 + 2j.
 */
export function divideComplex(a: Complex, b: Complex): Complex {
  if (Math.abs(b.re) >= Math.abs(b.im)) {
    const ratio = b.im / b.re;
    const denominator = b.re + b.im * ratio;
    return { re: (a.re + a.im * ratio) / denominator, im: (a.im - a.re * ratio) / denominator };
  }
  const ratio = b.re / b.im;
  const denominator = b.re * ratio + b.im;
  return { re: (a.re * ratio + a.im) / denominator, im: (a.im * ratio - a.re) / denominator };
}

/** 1 / a. Example: reciprocalComplex(complex(0, 2)) → −0.5j. */
export function reciprocalComplex(a: Complex): Complex {
  return divideComplex(COMPLEX_ONE, a);
}

/** |a|, without intermediate overflow. Example: magnitudeComplex(complex(3, 4)) → 5. */
export function magnitudeComplex(a: Complex): number {
  return Math.hypot(a.re, a.im);
}

/** arg(a) in degrees, −180 … 180. Example: phaseDegComplex(complex(0, 1)) → 90. */
export function phaseDegComplex(a: Complex): number {
  return (Math.atan2(a.im, a.re) * 180) / Math.PI;
}

/**
 * Solves the square complex linear system `A·x = b` by Gaussian elimination with
 * partial pivoting (Golub and Van Loan, Matrix Computations, §3.4). O(n³); meant
 * for the few nodes of an amplifier. The inputs are not modified.
 *
 * @param matrix n rows of n entries
 * @param rightHandSide n entries
 * @returns x, n entries
 * @throws Error when the sizes disagree or the matrix is singular
 * @example solveComplexLinearSystem([[complex(2)]], [complex(4, 2)]) // → [2 + 1j]
 */
export function solveComplexLinearSystem(matrix: readonly (readonly Complex[])[], rightHandSide: readonly Complex[]): Complex[] {
  const size = rightHandSide.length;
  if (matrix.length !== size || matrix.some((row) => row.length !== size)) {
    throw new Error(`solveComplexLinearSystem requires an ${size}×${size} matrix for ${size} right-hand-side entries`);
  }
  const rows = matrix.map((row, index) => [...row, rightHandSide[index]]);
  for (let column = 0; column < size; column++) {
    let pivotRow = column;
    for (let row = column + 1; row < size; row++) {
      if (magnitudeComplex(rows[row][column]) > magnitudeComplex(rows[pivotRow][column])) pivotRow = row;
    }
    if (magnitudeComplex(rows[pivotRow][column]) === 0) {
      throw new Error(`solveComplexLinearSystem: the matrix is singular (column ${column + 1} has no pivot)`);
    }
    [rows[column], rows[pivotRow]] = [rows[pivotRow], rows[column]];
    const pivot = rows[column][column];
    for (let row = column + 1; row < size; row++) {
      const factor = divideComplex(rows[row][column], pivot);
      if (factor.re === 0 && factor.im === 0) continue;
      for (let entry = column; entry <= size; entry++) {
        rows[row][entry] = subtractComplex(rows[row][entry], multiplyComplex(factor, rows[column][entry]));
      }
    }
  }
  const solution: Complex[] = new Array<Complex>(size);
  for (let row = size - 1; row >= 0; row--) {
    let sum = rows[row][size];
    for (let entry = row + 1; entry < size; entry++) sum = subtractComplex(sum, multiplyComplex(rows[row][entry], solution[entry]));
    solution[row] = divideComplex(sum, rows[row][row]);
  }
  return solution;
}
