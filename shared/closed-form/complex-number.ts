/** A complex number as plain data; s-plane poles and residues use it. */
export interface Complex {
  re: number;
  im: number;
}

/** @example complex(1, -2) // { re: 1, im: -2 } */
export function complex(re: number, im = 0): Complex {
  return { re, im };
}

/** a + b. */
export function addComplex(a: Complex, b: Complex): Complex {
  return { re: a.re + b.re, im: a.im + b.im };
}

/** a − b. */
export function subtractComplex(a: Complex, b: Complex): Complex {
  return { re: a.re - b.re, im: a.im - b.im };
}

/** a·b. @example multiplyComplex(complex(0, 1), complex(0, 1)) // { re: -1, im: 0 } */
export function multiplyComplex(a: Complex, b: Complex): Complex {
  return { re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re };
}

/** k·a for real k. */
export function scaleComplex(a: Complex, k: number): Complex {
  return { re: a.re * k, im: a.im * k };
}

/**
 * Quotient a / b by Smith's scaling, so |b| near the float limits neither overflows nor underflows.
 * @example divideComplex(complex(1), complex(0, 1)) // { re: 0, im: -1 }
 */
export function divideComplex(a: Complex, b: Complex): Complex {
  if (Math.abs(b.re) >= Math.abs(b.im)) {
    const r = b.im / b.re;
    const d = b.re + b.im * r;
    return { re: (a.re + a.im * r) / d, im: (a.im - a.re * r) / d };
  }
  const r = b.re / b.im;
  const d = b.re * r + b.im;
  return { re: (a.re * r + a.im) / d, im: (a.im * r - a.re) / d };
}

/** |a|, overflow-safe. @example absComplex(complex(3, 4)) // 5 */
export function absComplex(a: Complex): number {
  return Math.hypot(a.re, a.im);
}

/** The complex conjugate of a. */
export function conjugate(a: Complex): Complex {
  return { re: a.re, im: -a.im };
}

/** e^z. @example expComplex(complex(0, Math.PI)) // ≈ { re: -1, im: 0 } */
export function expComplex(z: Complex): Complex {
  const m = Math.exp(z.re);
  return z.im === 0 ? { re: m, im: 0 } : { re: m * Math.cos(z.im), im: m * Math.sin(z.im) };
}

/** z^n for a whole n ≥ 0 by repeated squaring. @example powComplex(complex(0, 1), 2) // { re: -1, im: 0 } */
export function powComplex(z: Complex, n: number): Complex {
  let result: Complex = { re: 1, im: 0 };
  let base = z;
  let k = n;
  while (k > 0) {
    if (k & 1) result = multiplyComplex(result, base);
    base = multiplyComplex(base, base);
    k >>= 1;
  }
  return result;
}
