/**
 * The 16 NIST StRD nonlinear-regression models, written by hand from the `model` strings of
 * test/reference/nist-strd/*.json (NIST Statistical Reference Datasets, nonlinear
 * regression, https://www.itl.nist.gov/div898/strd/nls/; provenance in test/reference/README.md),
 * with analytic gradients. Roszman1 uses the principal-value arctangent (Math.atan), as NIST
 * certifies (see test/reference/nist-strd/README.md). The data files are read at test time through
 * test/helpers/referenceData.ts: a missing file fails with one line saying how to restore it.
 */
import { readFileSync } from 'node:fs';
import type { CurveModel } from '../../../src/core/fit/levenbergMarquardt.js';
import { referenceFile } from '../../helpers/referenceData.js';

export interface NistSet {
  name: string;
  difficulty: 'lower' | 'average' | 'higher';
  model: string;
  x: number[];
  y: number[];
  start1: number[];
  start2: number[];
  certified: {
    params: number[];
    stdDev: number[];
    residualSumOfSquares: number;
    residualStdDev: number;
    degreesOfFreedom: number;
  };
}

export function loadNist(name: string): NistSet {
  return JSON.parse(readFileSync(referenceFile('nist-strd', `${name}.json`), 'utf8')) as NistSet;
}

const { exp, log, pow, atan, PI } = Math;

/** y = b1·(1 − exp(−b2·x)) (Misra1a, BoxBOD). */
const saturatingExp: CurveModel = {
  nParams: 2,
  value: (b, x) => b[0]! * (1 - exp(-b[1]! * x)),
  gradient: (b, x, g) => {
    const e = exp(-b[1]! * x);
    g[0] = 1 - e;
    g[1] = b[0]! * x * e;
  },
};

/** y = (b1 + b2·x + b3·x² + b4·x³) / (1 + b5·x + b6·x² + b7·x³) (Hahn1, Thurber). */
const cubicRational: CurveModel = {
  nParams: 7,
  value: (b, x) => {
    const num = b[0]! + x * (b[1]! + x * (b[2]! + x * b[3]!));
    const den = 1 + x * (b[4]! + x * (b[5]! + x * b[6]!));
    return num / den;
  },
  gradient: (b, x, g) => {
    const num = b[0]! + x * (b[1]! + x * (b[2]! + x * b[3]!));
    const den = 1 + x * (b[4]! + x * (b[5]! + x * b[6]!));
    const powers = [1, x, x * x, x * x * x];
    for (let k = 0; k < 4; k++) g[k] = powers[k]! / den;
    for (let k = 1; k < 4; k++) g[3 + k] = (-num * powers[k]!) / (den * den);
  },
};

export const NIST_MODELS: Record<string, CurveModel> = {
  Misra1a: saturatingExp,
  BoxBOD: saturatingExp,
  Hahn1: cubicRational,
  Thurber: cubicRational,
  Chwirut2: {
    nParams: 3,
    value: (b, x) => exp(-b[0]! * x) / (b[1]! + b[2]! * x),
    gradient: (b, x, g) => {
      const den = b[1]! + b[2]! * x;
      const f = exp(-b[0]! * x) / den;
      g[0] = -x * f;
      g[1] = -f / den;
      g[2] = (-x * f) / den;
    },
  },
  DanWood: {
    nParams: 2,
    value: (b, x) => b[0]! * pow(x, b[1]!),
    gradient: (b, x, g) => {
      const xp = pow(x, b[1]!);
      g[0] = xp;
      g[1] = b[0]! * xp * log(x);
    },
  },
  Misra1b: {
    nParams: 2,
    value: (b, x) => b[0]! * (1 - pow(1 + (b[1]! * x) / 2, -2)),
    gradient: (b, x, g) => {
      const u = 1 + (b[1]! * x) / 2;
      g[0] = 1 - pow(u, -2);
      g[1] = b[0]! * x * pow(u, -3);
    },
  },
  Gauss1: {
    nParams: 8,
    value: (b, x) =>
      b[0]! * exp(-b[1]! * x) +
      b[2]! * exp(-((x - b[3]!) ** 2) / b[4]! ** 2) +
      b[5]! * exp(-((x - b[6]!) ** 2) / b[7]! ** 2),
    gradient: (b, x, g) => {
      const e1 = exp(-b[1]! * x);
      g[0] = e1;
      g[1] = -b[0]! * x * e1;
      for (const k of [2, 5]) {
        const amp = b[k]!;
        const centre = b[k + 1]!;
        const width = b[k + 2]!;
        const d = x - centre;
        const gk = exp(-(d * d) / (width * width));
        g[k] = gk;
        g[k + 1] = (amp * gk * 2 * d) / (width * width);
        g[k + 2] = (amp * gk * 2 * d * d) / (width * width * width);
      }
    },
  },
  Lanczos3: {
    nParams: 6,
    value: (b, x) => b[0]! * exp(-b[1]! * x) + b[2]! * exp(-b[3]! * x) + b[4]! * exp(-b[5]! * x),
    gradient: (b, x, g) => {
      for (const k of [0, 2, 4]) {
        const e = exp(-b[k + 1]! * x);
        g[k] = e;
        g[k + 1] = -b[k]! * x * e;
      }
    },
  },
  Kirby2: {
    nParams: 5,
    value: (b, x) => (b[0]! + b[1]! * x + b[2]! * x * x) / (1 + b[3]! * x + b[4]! * x * x),
    gradient: (b, x, g) => {
      const num = b[0]! + b[1]! * x + b[2]! * x * x;
      const den = 1 + b[3]! * x + b[4]! * x * x;
      g[0] = 1 / den;
      g[1] = x / den;
      g[2] = (x * x) / den;
      g[3] = (-num * x) / (den * den);
      g[4] = (-num * x * x) / (den * den);
    },
  },
  Roszman1: {
    nParams: 4,
    value: (b, x) => b[0]! - b[1]! * x - atan(b[2]! / (x - b[3]!)) / PI,
    gradient: (b, x, g) => {
      const d = x - b[3]!;
      const u = b[2]! / d;
      const datan = 1 / (1 + u * u);
      g[0] = 1;
      g[1] = -x;
      g[2] = -(datan / d) / PI;
      g[3] = -((datan * b[2]!) / (d * d)) / PI;
    },
  },
  Bennett5: {
    nParams: 3,
    value: (b, x) => b[0]! * pow(b[1]! + x, -1 / b[2]!),
    gradient: (b, x, g) => {
      const base = b[1]! + x;
      const f = pow(base, -1 / b[2]!);
      g[0] = f;
      g[1] = (-b[0]! / b[2]!) * (f / base);
      g[2] = (b[0]! * f * log(base)) / (b[2]! * b[2]!);
    },
  },
  Eckerle4: {
    nParams: 3,
    value: (b, x) => (b[0]! / b[1]!) * exp(-0.5 * ((x - b[2]!) / b[1]!) ** 2),
    gradient: (b, x, g) => {
      const t = (x - b[2]!) / b[1]!;
      const e = exp(-0.5 * t * t);
      g[0] = e / b[1]!;
      g[1] = ((b[0]! * e) / (b[1]! * b[1]!)) * (t * t - 1);
      g[2] = ((b[0]! * e) / (b[1]! * b[1]!)) * t;
    },
  },
  MGH09: {
    nParams: 4,
    value: (b, x) => (b[0]! * (x * x + x * b[1]!)) / (x * x + x * b[2]! + b[3]!),
    gradient: (b, x, g) => {
      const num = x * x + x * b[1]!;
      const den = x * x + x * b[2]! + b[3]!;
      g[0] = num / den;
      g[1] = (b[0]! * x) / den;
      g[2] = (-b[0]! * num * x) / (den * den);
      g[3] = (-b[0]! * num) / (den * den);
    },
  },
  Rat42: {
    nParams: 3,
    value: (b, x) => b[0]! / (1 + exp(b[1]! - b[2]! * x)),
    gradient: (b, x, g) => {
      const e = exp(b[1]! - b[2]! * x);
      const d = 1 + e;
      g[0] = 1 / d;
      g[1] = (-b[0]! * e) / (d * d);
      g[2] = (b[0]! * x * e) / (d * d);
    },
  },
  Rat43: {
    nParams: 4,
    value: (b, x) => b[0]! / pow(1 + exp(b[1]! - b[2]! * x), 1 / b[3]!),
    gradient: (b, x, g) => {
      const e = exp(b[1]! - b[2]! * x);
      const base = 1 + e;
      const f = pow(base, -1 / b[3]!);
      g[0] = f;
      g[1] = ((-b[0]! / b[3]!) * f * e) / base;
      g[2] = ((b[0]! / b[3]!) * f * e * x) / base;
      g[3] = (b[0]! * f * log(base)) / (b[3]! * b[3]!);
    },
  },
};

export const NIST_NAMES = [
  'Misra1a', 'Chwirut2', 'DanWood', 'Misra1b', 'Gauss1', 'Lanczos3',
  'Hahn1', 'Kirby2', 'Roszman1',
  'Bennett5', 'BoxBOD', 'Eckerle4', 'MGH09', 'Rat42', 'Rat43', 'Thurber',
] as const;

/** Degrees of freedom to check against: n − p (NIST prints 9 for Rat43, an error in its text; see the README). */
export function expectedDof(set: NistSet): number {
  return set.x.length - set.start1.length;
}
