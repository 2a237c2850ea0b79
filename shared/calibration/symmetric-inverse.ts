/**
 * Inverse of a small symmetric positive semi-definite matrix (the Gauss–Newton matrix JᵀJ of a
 * fit, a few parameters across), or null when it is singular to working precision. The matrix is
 * first scaled to a unit diagonal (Jacobi scaling), so "singular" means a parameter is a linear
 * combination of the others, not merely in other units; then Gauss–Jordan elimination with
 * partial pivoting (common practice).
 */

/** Pivot below which the unit-diagonal matrix counts as singular. */
export const SINGULAR_PIVOT = 1e-12;

/**
 * @example symmetricInverse([[4, 2], [2, 3]]) // [[0.375, -0.25], [-0.25, 0.5]]
 */
export function symmetricInverse(a: readonly (readonly number[])[]): number[][] | null {
  const n = a.length;
  const d = a.map((row, i) => {
    const diag = row[i]!;
    return diag > 0 && Number.isFinite(diag) ? 1 / Math.sqrt(diag) : 0;
  });
  if (d.some((x) => x === 0)) return null;
  // [D A D | I], reduced to [I | (D A D)⁻¹].
  const m = a.map((row, i) => [...row.map((x, j) => x * d[i]! * d[j]!), ...row.map((_, j) => (i === j ? 1 : 0))]);
  for (let col = 0; col < n; col++) {
    let pivotRow = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(m[r]![col]!) > Math.abs(m[pivotRow]![col]!)) pivotRow = r;
    const pivot = m[pivotRow]![col]!;
    if (!(Math.abs(pivot) > SINGULAR_PIVOT)) return null;
    [m[col], m[pivotRow]] = [m[pivotRow]!, m[col]!];
    const row = m[col]!;
    for (let c = 0; c < 2 * n; c++) row[c]! /= pivot;
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const factor = m[r]![col]!;
      if (factor === 0) continue;
      for (let c = 0; c < 2 * n; c++) m[r]![c]! -= factor * row[c]!;
    }
  }
  return m.map((row, i) => row.slice(n).map((x, j) => x * d[i]! * d[j]!));
}
