/**
 * The sections of docs/recording-a-run.md, by stable anchor, each with one line of advice.
 * `analyze` puts the anchor on a warning (`RunWarning.guideSection`); the reports link the
 * warning to that section and quote the advice inline, because a report is often opened on
 * another machine where the docs are not at hand. A test checks that every anchor here exists
 * in the docs file.
 * @example guideAdvice('avoid-clipping')?.title === 'Keep the spot below clipping'
 */
export interface GuideSection {
  anchor: GuideAnchor;
  title: string;
  advice: string;
}

export type GuideAnchor =
  | 'lock-exposure'
  | 'avoid-clipping'
  | 'open-level'
  | 'sweep'
  | 'voltage-log'
  | 'temperature'
  | 'camera-still'
  | 'sync'
  | 'safety'
  | 'lock-camera'
  | 'calibrate-camera';

/** Path of the guide inside the installed package, relative to the package root. */
export const GUIDE_FILE = 'docs/recording-a-run.md';

export const GUIDE_SECTIONS: readonly GuideSection[] = [
  {
    anchor: 'lock-exposure',
    title: 'Lock exposure and white balance',
    advice: 'Lock exposure, focus and white balance before recording, or keep a constant reference card in view so brightness changes can be corrected.',
  },
  {
    anchor: 'lock-camera',
    title: 'Lock the camera\'s picture processing',
    advice: 'Turn HDR off, lock exposure and white balance, and use a pro or manual mode where the phone has one, so the code values follow a known curve.',
  },
  {
    anchor: 'calibrate-camera',
    title: 'Record a calibration once per camera and setting',
    advice: 'Film the beam while turning the analyser through known angles and run `kerrtrace calibrate-camera`; pass the profile to analyze with --camera-profile.',
  },
  {
    anchor: 'avoid-clipping',
    title: 'Keep the spot below clipping',
    advice: 'Keep the brightest part of the spot below full white: defocus it, add a neutral-density filter or lower the exposure.',
  },
  {
    anchor: 'open-level',
    title: 'Record the open level',
    advice: 'Record a few seconds with the analyser parallel and no voltage applied, so the full brightness is known.',
  },
  {
    anchor: 'sweep',
    title: 'Sweep slowly, up and down',
    advice: 'Sweep the voltage up and down slowly; go past the half-wave voltage only if the cell and supply are rated for it.',
  },
  {
    anchor: 'voltage-log',
    title: 'Log the voltage',
    advice: 'Log the voltage at 5 samples per second or more, with a time column, for the whole recording.',
  },
  {
    anchor: 'temperature',
    title: 'Note the temperature',
    advice: "Note the liquid's temperature with every run: the Kerr constant of polar liquids falls as it warms.",
  },
  {
    anchor: 'camera-still',
    title: 'Keep the camera still',
    advice: 'Mount the camera on a stand; do not touch it while recording.',
  },
  {
    anchor: 'sync',
    title: 'Make the two clocks easy to align',
    advice: 'Start the logger and the camera so their spans overlap, and make one clear voltage change early in the recording.',
  },
  {
    anchor: 'safety',
    title: 'Safety',
    advice: 'Lethal voltages, stored charge, ozone, toxic liquids and lasers: follow local codes, safety data sheets and licensed practice.',
  },
];

/** The section for an anchor, or undefined when the anchor is unknown. */
export function guideAdvice(anchor: string): GuideSection | undefined {
  return GUIDE_SECTIONS.find((s) => s.anchor === anchor);
}
