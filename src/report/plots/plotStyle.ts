/**
 * The look shared by every plot: the Okabe–Ito colour-blind-safe palette (M. Okabe and K. Ito,
 * "Color Universal Design", 2002/2008), a white background for print, quiet grey axes, and a
 * fixed mapping from series to colour + dash + marker shape so that no series is told apart by
 * colour alone (greyscale print and colour-blind readers still see dash and shape).
 * @example SERIES.model.dash → [6, 3] (the fitted model is always dashed)
 */
export const OKABE_ITO = {
  black: '#000000',
  orange: '#E69F00',
  skyBlue: '#56B4E9',
  bluishGreen: '#009E73',
  yellow: '#F0E442',
  blue: '#0072B2',
  vermillion: '#D55E00',
  reddishPurple: '#CC79A7',
} as const;

export interface SeriesStyle {
  label: string;
  colour: string;
  /** Stroke dash pattern (empty for solid). */
  dash: number[];
  /** Vega point shape. */
  shape: string;
}

export const SERIES = {
  measured: { label: 'measured', colour: OKABE_ITO.blue, dash: [], shape: 'circle' },
  model: { label: 'fitted model', colour: OKABE_ITO.vermillion, dash: [6, 3], shape: 'diamond' },
  voltage: { label: 'voltage (log)', colour: OKABE_ITO.bluishGreen, dash: [], shape: 'square' },
  excluded: { label: 'excluded frame', colour: OKABE_ITO.black, dash: [], shape: 'cross' },
  regression: { label: 'regression line', colour: OKABE_ITO.vermillion, dash: [6, 3], shape: 'diamond' },
  chosen: { label: 'chosen offset', colour: OKABE_ITO.vermillion, dash: [4, 2], shape: 'triangle-down' },
} as const satisfies Record<string, SeriesStyle>;

/** Marker shape and colour per event kind (RunEvent.kind). */
export const EVENT_STYLE: Record<string, { colour: string; shape: string }> = {
  spark: { colour: OKABE_ITO.reddishPurple, shape: 'triangle-up' },
  particle: { colour: OKABE_ITO.orange, shape: 'diamond' },
  clipped: { colour: OKABE_ITO.skyBlue, shape: 'square' },
  'exposure-jump': { colour: OKABE_ITO.black, shape: 'triangle-down' },
};

/** Vega-Lite `config` block used by every spec. */
export const PLOT_CONFIG = {
  background: '#ffffff',
  padding: 8,
  // Per-mark ARIA labels would repeat every data value in the SVG; the report's captions describe the plots instead.
  aria: false,
  font: 'DejaVu Sans, Helvetica, Arial, sans-serif',
  view: { stroke: '#c9ced6', strokeWidth: 1 },
  axis: {
    domainColor: '#7b8494',
    tickColor: '#7b8494',
    gridColor: '#e6e9ee',
    labelColor: '#2b3240',
    titleColor: '#1d2433',
    labelFontSize: 11,
    titleFontSize: 12,
    titleFontWeight: 600,
  },
  legend: { labelFontSize: 11, titleFontSize: 11, labelColor: '#2b3240', titleColor: '#1d2433', orient: 'top', direction: 'horizontal', symbolSize: 90 },
  title: { fontSize: 13, fontWeight: 600, color: '#1d2433', anchor: 'start' },
  line: { strokeWidth: 1.6 },
  point: { size: 18 },
} as const;

/** Vega-Lite schema URL recorded in specs (never fetched: rendering uses the bundled compiler). */
export const VEGA_LITE_SCHEMA = 'https://vega.github.io/schema/vega-lite/v6.json';

/** A Vega-Lite specification as plain data (compiled by renderPlot.ts). */
export type VegaLiteSpec = { $schema: string } & Record<string, unknown>;

/** Largest number of points drawn per series; longer series are thinned by downsampleMinMax. */
export const MAX_POINTS_PER_SERIES = 2000;

/** What every spec builder returns: the spec, and whether (and how much) it thinned the data. */
export interface PlotSpecResult {
  spec: VegaLiteSpec;
  /** True when some series were thinned for plotting. */
  thinned: boolean;
  /** Points drawn / points available, per series name. */
  counts: Record<string, { drawn: number; available: number }>;
}

/** Axis title for measured intensity, on two lines so it never outgrows a short panel. */
export const INTENSITY_TITLE = ['intensity', '(linear, dark-subtracted)'];
