/**
 * Periodic curves as short Fourier series over the gait-cycle phase φ ∈ [0, 1), fitted through
 * key values (and optional slopes) with the smoothest such series. Pure.
 */

/** f(φ) = a0 + Σₖ aₖ·cos(2πkφ) + bₖ·sin(2πkφ), k = 1…harmonics. */
export interface FourierSeries {
  a0: number;
  a: number[];
  b: number[];
}

/** A condition on the curve: its value and/or its slope (per unit phase) at phase `phi`. */
export interface KeyPoint {
  phi: number;
  value?: number;
  slope?: number;
}

const TAU = 2 * Math.PI;

/** Value of a series at phase φ. */
export function evalSeries(s: FourierSeries, phi: number): number {
  let v = s.a0;
  for (let k = 1; k <= s.a.length; k++) v += s.a[k - 1]! * Math.cos(TAU * k * phi) + s.b[k - 1]! * Math.sin(TAU * k * phi);
  return v;
}

/** Slope dv/dφ of a series at phase φ. */
export function slopeSeries(s: FourierSeries, phi: number): number {
  let d = 0;
  for (let k = 1; k <= s.a.length; k++) d += TAU * k * (-s.a[k - 1]! * Math.sin(TAU * k * phi) + s.b[k - 1]! * Math.cos(TAU * k * phi));
  return d;
}

/** Solves a square linear system by Gaussian elimination with partial pivoting. */
export function solveLinear(matrix: number[][], rhs: number[]): number[] {
  const n = rhs.length;
  const m = matrix.map((row, i) => [...row, rhs[i]!]);
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(m[r]![col]!) > Math.abs(m[pivot]![col]!)) pivot = r;
    if (Math.abs(m[pivot]![col]!) < 1e-12) throw new Error('solveLinear: singular system');
    [m[col], m[pivot]] = [m[pivot]!, m[col]!];
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const f = m[r]![col]! / m[col]![col]!;
      if (f !== 0) for (let c = col; c <= n; c++) m[r]![c]! -= f * m[col]![c]!;
    }
  }
  return m.map((row, i) => row[n]! / row[i]!);
}

/**
 * The smoothest series with `harmonics` terms meeting every key value and slope exactly:
 * minimises Σₖ k⁴(aₖ² + bₖ²) (mean squared curvature) subject to the conditions, via the KKT
 * system. Needs no more conditions than 2·harmonics + 1, at distinct phases.
 */
export function fitSeries(points: KeyPoint[], harmonics: number): FourierSeries {
  const n = 2 * harmonics + 1;
  const rows: number[][] = [];
  const targets: number[] = [];
  for (const p of points) {
    if (p.value !== undefined) {
      const row = [1];
      for (let k = 1; k <= harmonics; k++) row.push(Math.cos(TAU * k * p.phi));
      for (let k = 1; k <= harmonics; k++) row.push(Math.sin(TAU * k * p.phi));
      rows.push(row);
      targets.push(p.value);
    }
    if (p.slope !== undefined) {
      const row = [0];
      for (let k = 1; k <= harmonics; k++) row.push(-TAU * k * Math.sin(TAU * k * p.phi));
      for (let k = 1; k <= harmonics; k++) row.push(TAU * k * Math.cos(TAU * k * p.phi));
      rows.push(row);
      targets.push(p.slope);
    }
  }
  const m = rows.length;
  if (m > n) throw new Error(`fitSeries: ${m} conditions need at least ${Math.ceil((m - 1) / 2)} harmonics`);
  // KKT: [2W Aᵀ; A 0] [c; λ] = [0; y], W = diag(0, k⁴…, k⁴…)
  const size = n + m;
  const kkt = Array.from({ length: size }, () => new Array<number>(size).fill(0));
  for (let i = 1; i < n; i++) {
    const k = i <= harmonics ? i : i - harmonics;
    kkt[i]![i] = 2 * k ** 4;
  }
  rows.forEach((row, r) => {
    row.forEach((v, c) => {
      kkt[n + r]![c] = v;
      kkt[c]![n + r] = v;
    });
  });
  const solution = solveLinear(kkt, [...new Array<number>(n).fill(0), ...targets]);
  return { a0: solution[0]!, a: solution.slice(1, harmonics + 1), b: solution.slice(harmonics + 1, n) };
}

/** 0 → 1 with zero first and second derivatives at both ends (quintic smootherstep). */
export function smootherstep(edge0: number, edge1: number, x: number): number {
  const t = Math.min(1, Math.max(0, (x - edge0) / (edge1 - edge0)));
  return t * t * t * (t * (6 * t - 15) + 10);
}
