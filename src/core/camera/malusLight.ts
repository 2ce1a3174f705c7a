/**
 * Relative light of a calibration recording from Malus's law, I = I₀·cos²(θ − θ₀) + leak, where θ
 * is the analyser's angle and θ₀ the angle at which the light is brightest (analyser parallel to
 * the polariser). The camera's code value is a monotone function of the light, so it is an even
 * function of θ − θ₀ with period 180°: fitting c ≈ a₀ + a₁cos2θ + b₁sin2θ + a₂cos4θ + b₂sin4θ by
 * least squares gives θ₀ = ½·atan2(b₁, a₁) (the phase of the first harmonic of an even function),
 * whatever the camera's curve, up to the aliasing of the curve's higher harmonics onto the first
 * (a few hundredths of a degree for 15° steps over a half-turn, about 0.2° for uneven steps in the
 * tests). Returned light: x = cos²(θ − θ₀) (affine units; see fitResponseTable).
 *
 * A steady rotation (`lightFromSteadyRotation`): the analyser's angle is θ = 2π·t/T_turn, so the
 * light has period P = T_turn/2; P is found as the frequency of largest first-harmonic power of the
 * code series over 1.5/span … (frame rate)/4 (a grid of 1/(8·span)), refined by golden section to
 * the frequency at which the two-harmonic model above explains the codes best (least residual
 * sum of squares), and θ = π·t/P. At least 1.5 light periods must be in the clip.
 *
 * Pure. @throws KerrError NOT_IDENTIFIABLE when the angles cover less than 60° of one half-turn,
 * or no period stands out (power at the peak less than 4× the median over the searched band).
 * @example lightFromAngles([0, 30, 60, 90], codes) // { light: [1, 0.75, 0.25, 0], brightestAtDeg: ≈0 }
 */
import { KerrError } from '../../errors.js';

const DEG = Math.PI / 180;

/** Least squares of c on [1, cos2θ, sin2θ, cos4θ, sin4θ]: returns the five coefficients. */
function harmonicFit(thetaRad: ArrayLike<number>, codes: ArrayLike<number>): number[] {
  const p = 5;
  const a = new Float64Array(p * p);
  const r = new Float64Array(p);
  const row = new Float64Array(p);
  for (let i = 0; i < codes.length; i++) {
    const t = thetaRad[i]!;
    row[0] = 1; row[1] = Math.cos(2 * t); row[2] = Math.sin(2 * t); row[3] = Math.cos(4 * t); row[4] = Math.sin(4 * t);
    for (let j = 0; j < p; j++) {
      r[j] += row[j]! * codes[i]!;
      for (let k = 0; k < p; k++) a[j * p + k] += row[j]! * row[k]!;
    }
  }
  // Gaussian elimination with partial pivoting (5×5)
  for (let c = 0; c < p; c++) {
    let piv = c;
    for (let k = c + 1; k < p; k++) if (Math.abs(a[k * p + c]!) > Math.abs(a[piv * p + c]!)) piv = k;
    if (Math.abs(a[piv * p + c]!) < 1e-12) return [NaN, NaN, NaN, NaN, NaN];
    if (piv !== c) {
      for (let k = 0; k < p; k++) { const t = a[c * p + k]!; a[c * p + k] = a[piv * p + k]!; a[piv * p + k] = t; }
      const t = r[c]!; r[c] = r[piv]!; r[piv] = t;
    }
    for (let k = c + 1; k < p; k++) {
      const f = a[k * p + c]! / a[c * p + c]!;
      for (let j = c; j < p; j++) a[k * p + j] -= f * a[c * p + j]!;
      r[k] -= f * r[c]!;
    }
  }
  const out = new Array<number>(p).fill(0);
  for (let c = p - 1; c >= 0; c--) {
    let s = r[c]!;
    for (let j = c + 1; j < p; j++) s -= a[c * p + j]! * out[j]!;
    out[c] = s / a[c * p + c]!;
  }
  return out;
}

export interface MalusLight {
  /** cos²(θ − θ₀) per point. */
  light: Float64Array;
  /** θ₀, degrees in (−90, 90]. */
  brightestAtDeg: number;
}

/** Light from known analyser angles (degrees, any zero). */
export function lightFromAngles(anglesDeg: ArrayLike<number>, codes: ArrayLike<number>): MalusLight {
  const n = codes.length;
  const theta = Float64Array.from({ length: n }, (_v, i) => anglesDeg[i]! * DEG);
  // coverage of the half-turn: the largest empty arc (mod 180°) must leave at least 60° covered
  const folded = Array.from(theta, (t) => ((t % Math.PI) + Math.PI) % Math.PI).sort((a, b) => a - b);
  let gap = folded.length > 0 ? Math.PI - folded[folded.length - 1]! + folded[0]! : Math.PI;
  for (let i = 1; i < folded.length; i++) gap = Math.max(gap, folded[i]! - folded[i - 1]!);
  if (n < 5 || Math.PI - gap < 60 * DEG) {
    throw new KerrError('NOT_IDENTIFIABLE', `the analyser angles cover only ${((Math.PI - gap) / DEG).toFixed(0)}° of a half-turn`, {
      hint: 'Turn the analyser from parallel to crossed (0° to 90°) or further, in steps of 15° or less',
    });
  }
  const c = harmonicFit(theta, codes);
  if (!c.every(Number.isFinite)) throw new KerrError('NOT_IDENTIFIABLE', 'the analyser angles do not determine where the light is brightest', { hint: 'Spread the angles over a half-turn' });
  // a₁cos2θ + b₁sin2θ = R·cos(2θ − φ), largest at θ = φ/2
  const theta0 = 0.5 * Math.atan2(c[2]!, c[1]!);
  const brightestAtDeg = theta0 / DEG;
  const light = Float64Array.from(theta, (t) => Math.cos(t - theta0) ** 2);
  return { light, brightestAtDeg };
}

/** First-harmonic power of (codes − mean) at frequency f (Hz). */
function powerAt(timesS: ArrayLike<number>, centred: Float64Array, f: number): number {
  let re = 0, im = 0;
  for (let i = 0; i < centred.length; i++) {
    const w = 2 * Math.PI * f * timesS[i]!;
    re += centred[i]! * Math.cos(w);
    im += centred[i]! * Math.sin(w);
  }
  return re * re + im * im;
}

export interface SteadyRotationLight extends MalusLight {
  /** Period of the light (half a turn of the analyser), s. */
  lightPeriodS: number;
}

/** Light from a steady rotation: finds the period, then the phase. */
export function lightFromSteadyRotation(timesS: ArrayLike<number>, codes: ArrayLike<number>): SteadyRotationLight {
  const n = codes.length;
  if (n < 16) throw new KerrError('NOT_IDENTIFIABLE', `only ${n} frames in the calibration clip`, { hint: 'Record at least two full turns of the analyser' });
  const spanS = timesS[n - 1]! - timesS[0]!;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += codes[i]!;
  mean /= n;
  const centred = Float64Array.from({ length: n }, (_v, i) => codes[i]! - mean);
  const fps = (n - 1) / spanS;
  const fLo = 1.5 / spanS, fHi = fps / 4, df = 1 / (8 * spanS);
  if (!(fHi > fLo)) throw new KerrError('NOT_IDENTIFIABLE', 'the calibration clip is too short to find the rotation', { hint: 'Record at least two full turns of the analyser' });
  const powers: number[] = [];
  let bestF = fLo, bestP = -1;
  for (let f = fLo; f <= fHi; f += df) {
    const pw = powerAt(timesS, centred, f);
    powers.push(pw);
    if (pw > bestP) { bestP = pw; bestF = f; }
  }
  const sorted = powers.slice().sort((a, b) => a - b);
  const medianPower = sorted[sorted.length >> 1]!;
  if (!(bestP > 4 * medianPower)) {
    throw new KerrError('NOT_IDENTIFIABLE', 'no steady rotation found in the calibration clip (no period stands out)', {
      hint: 'Turn the analyser steadily for at least two full turns, or give the analyser angles',
      inputs: ['analyserAngles'],
    });
  }
  // golden-section refinement within ±df: largest share of the codes explained by the two-harmonic
  // model at that frequency (free of the periodogram's leakage over a few periods)
  const explained = (f: number): number => {
    const theta = Float64Array.from({ length: n }, (_v, i) => Math.PI * f * timesS[i]!);
    const c = harmonicFit(theta, codes);
    if (!c.every(Number.isFinite)) return -Infinity;
    let rss = 0;
    for (let i = 0; i < n; i++) {
      const t = theta[i]!;
      const m = c[0]! + c[1]! * Math.cos(2 * t) + c[2]! * Math.sin(2 * t) + c[3]! * Math.cos(4 * t) + c[4]! * Math.sin(4 * t);
      rss += (codes[i]! - m) ** 2;
    }
    return -rss;
  };
  let a = bestF - df, b = bestF + df;
  const g = (Math.sqrt(5) - 1) / 2;
  let x1 = b - g * (b - a), x2 = a + g * (b - a);
  let p1 = explained(x1), p2 = explained(x2);
  for (let k = 0; k < 60 && b - a > 1e-9 * bestF; k++) {
    if (p1 > p2) { b = x2; x2 = x1; p2 = p1; x1 = b - g * (b - a); p1 = explained(x1); }
    else { a = x1; x1 = x2; p1 = p2; x2 = a + g * (b - a); p2 = explained(x2); }
  }
  const f = (a + b) / 2;
  const lightPeriodS = 1 / f;
  // angle of the analyser in degrees: 180° per light period
  const anglesDeg = Float64Array.from({ length: n }, (_v, i) => 180 * f * timesS[i]!);
  const { light, brightestAtDeg } = lightFromAngles(anglesDeg, codes);
  return { light, brightestAtDeg, lightPeriodS };
}
