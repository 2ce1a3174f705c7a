/**
 * How strongly each camera channel (R, G, B) sees monochromatic light of a given wavelength, for
 * the simulator's default channel weights. This is a rough camera response of our own, not a
 * measured one: three Gaussian bands centred at 600, 535 and 460 nm with standard deviations of
 * 40, 40 and 30 nm, scaled so that the strongest channel is 1.
 * Units: wavelength in nm (valid 350–800); weights are dimensionless. Throws nothing.
 * @example channelWeightsForWavelength(532) ≈ [0.24, 1, 0.06] (green laser: mostly G)
 */
const BANDS: ReadonlyArray<{ centreNm: number; sigmaNm: number }> = [
  { centreNm: 600, sigmaNm: 40 },
  { centreNm: 535, sigmaNm: 40 },
  { centreNm: 460, sigmaNm: 30 },
];

export function channelWeightsForWavelength(wavelengthNm: number): [number, number, number] {
  const raw = BANDS.map((b) => Math.exp(-((wavelengthNm - b.centreNm) ** 2) / (2 * b.sigmaNm * b.sigmaNm)));
  const top = Math.max(...raw);
  const scaled = raw.map((w) => Number((w / top).toFixed(4)));
  return [scaled[0]!, scaled[1]!, scaled[2]!];
}
