/**
 * The safety cautions of the trade, as data, for every place that shows them (run and comparison
 * reports, the design calculator, docs). Sources: common practice of high-voltage and laser work;
 * the design brief's safety list. The text informs; it does not replace local electrical codes,
 * the safety data sheet of each liquid, laser-safety rules or licensed practice, and it never
 * suggests exceeding a rating.
 * @example SAFETY_CAUTIONS.map((c) => c.id) includes 'lethal-voltage' and 'toxic-liquids'
 */
export interface SafetyCaution {
  id: 'lethal-voltage' | 'stored-charge' | 'ozone' | 'toxic-liquids' | 'flammable-liquids' | 'lasers' | 'ratings';
  title: string;
  text: string;
}

export const SAFETY_CAUTIONS: readonly SafetyCaution[] = [
  {
    id: 'lethal-voltage',
    title: 'Lethal voltage',
    text: 'Kerr cells run at kilovolts from supplies that can kill. Work on the circuit only when it is switched off, disconnected and proven dead; keep one hand away and never work alone.',
  },
  {
    id: 'stored-charge',
    title: 'Stored charge after switch-off',
    text: 'Voltage multipliers, filter capacitors and the cell itself hold charge after the supply is off. Discharge them through a suitable grounding stick and leave a ground lead on before touching anything.',
  },
  {
    id: 'ozone',
    title: 'Ozone from corona',
    text: 'Corona at sharp edges and thin wires makes ozone, an irritant gas. Ventilate the room and treat a hissing sound or sharp smell as a fault to fix.',
  },
  {
    id: 'toxic-liquids',
    title: 'Toxic liquids',
    text: 'Many good Kerr liquids are toxic. Nitrobenzene is poisonous and is absorbed through the skin and by breathing its vapour: use suitable gloves, eye protection and ventilation as its safety data sheet requires.',
  },
  {
    id: 'flammable-liquids',
    title: 'Flammable liquids',
    text: 'Several Kerr liquids and cleaning solvents are flammable, and a spark or arc can ignite their vapour. Keep quantities small, containers closed and the high voltage away from open liquid.',
  },
  {
    id: 'lasers',
    title: 'Lasers',
    text: 'Laser beams and their reflections harm eyes and camera sensors. Use the lowest power that works, block stray reflections and wear eyewear rated for the wavelength.',
  },
  {
    id: 'ratings',
    title: 'Stay within ratings',
    text: 'Never exceed the voltage rating of the cell, the supply, the cables or the insulation; a measurement is never worth a breakdown.',
  },
];

/** The sentence that follows the cautions wherever they are shown. */
export const SAFETY_DEFERENCE =
  'These notes do not replace your local electrical and laser-safety codes, the safety data sheet of each liquid, or the advice of a licensed professional; follow those first.';
