/**
 * The built-in demo: a bench characterising a candidate Kerr liquid before and after a
 * purification step, in the same cell. EVERY NUMBER HERE IS INVENTED DEMO DATA — it describes no
 * real liquid or measurement. The "before" liquid scatters more (higher depolarised floor, a
 * brighter forward-scatter halo, particles drifting through the beam, one spark); after
 * purification the floor and halo drop and the Kerr constant stays the same.
 */
const cell = {
  kerrConstantMPerV2: 2.2e-12,
  lengthMm: 40,
  gapMm: 4,
  extinctionRatio: 5000,
  liquidBreakdownKvPerMm: 6,
  resistivityOhmM: 2e9,
  electrodeHeightMm: 12,
  temperatureC: 21.5,
};

const camera = {
  widthPx: 320,
  heightPx: 240,
  frameRateHz: 30,
  ambient: 0.01,
  transfer: 'srgb',
  photonsPerFullScale: 12000,
  readNoise: 0.0015,
  crf: 18,
  referencePatch: { xPx: 20, yPx: 180, widthPx: 50, heightPx: 40, radiance: 0.2 },
};

const drive = {
  startV: 0,
  segments: [
    { kind: 'hold', durationS: 1.5 },
    { kind: 'ramp', toHalfWaveFraction: 1.1, durationS: 5 },
    { kind: 'ramp', toV: 0, durationS: 5 },
    { kind: 'hold', durationS: 1.5 },
  ],
};

const logger = {
  sampleRateHz: 10,
  noiseV: 12,
  clockOffsetS: 0.7,
  timeUnit: 's',
  voltageUnit: 'kV',
  currentUnit: 'uA',
  currentNoiseA: 2e-9,
};

const light = { profile: 'gaussian', sigmaPx: 10, centreXPx: 190, centreYPx: 110, wavelengthNm: 532, amplitude: 0.6 };

export const DEMO_BEFORE = {
  label: 'demo: candidate liquid, before purification',
  notes: 'Invented demo data. Same cell as the after run; dirtier liquid.',
  seed: 2026,
  cell: { ...cell, resistivityOhmM: 5e8 },
  light,
  dirt: {
    scatterFloor: 0.02,
    haloPeak: 0.012,
    haloSigmaPx: 70,
    particles: { count: 5, durationS: 0.3, brightness: 0.6, sizePx: 2 },
    sparks: { timesS: [7.25], brightness: 0.5 },
  },
  camera,
  drive,
  logger,
};

export const DEMO_AFTER = {
  label: 'demo: candidate liquid, after purification',
  notes: 'Invented demo data. Same cell as the before run; purified liquid.',
  seed: 2027,
  cell,
  light,
  dirt: {
    scatterFloor: 0.006,
    haloPeak: 0.003,
    haloSigmaPx: 70,
    particles: { count: 1, durationS: 0.3, brightness: 0.6, sizePx: 2 },
  },
  camera,
  drive,
  logger: { ...logger, clockOffsetS: -0.4 },
};

/** The cell geometry the demo analyses with (the same as the scenarios above). */
export const DEMO_CELL = { lengthMm: cell.lengthMm, gapMm: cell.gapMm, electrodeHeightMm: cell.electrodeHeightMm, wavelengthNm: light.wavelengthNm };
export const DEMO_REFERENCE_ROI = { x: 24, y: 184, w: 42, h: 32 };
/** The beam (σ = 10 px around 190, 110) ± 1.5 σ and a dark corner, for the demo's photo series. */
export const DEMO_PHOTO_ROI = '175,95,31,31';
export const DEMO_PHOTO_DARK_ROI = '250,10,60,40';
