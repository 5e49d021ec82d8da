/**
 * The look of every plot, in one place: palette, roles of the colours, fonts and sizes,
 * and the Vega-Lite `config` block that every builder writes into its spec.
 *
 * Colours come from the palette of Okabe & Ito (2008, "Color Universal Design: how to
 * make figures and presentations that are friendly to colorblind people", J*FLY), which
 * stays distinguishable under the common forms of colour blindness. Series are told apart
 * by dash pattern and mark shape too, never by colour alone.
 */

/** The eight colours of Okabe & Ito (2008), by their published names. */
export const OKABE_ITO = Object.freeze({
  black: '#000000',
  orange: '#E69F00',
  skyBlue: '#56B4E9',
  bluishGreen: '#009E73',
  yellow: '#F0E442',
  blue: '#0072B2',
  vermillion: '#D55E00',
  reddishPurple: '#CC79A7',
});

/** Colours, fonts and sizes used by the plot builders. */
export interface PlotTheme {
  /** CSS font stack for every text element. */
  readonly fontFamily: string;
  /** Title size in px. */
  readonly titleFontSize: number;
  /** Subtitle size in px. */
  readonly subtitleFontSize: number;
  /** Axis title size in px. */
  readonly axisTitleFontSize: number;
  /** Axis tick label and legend label size in px. */
  readonly labelFontSize: number;
  /** Line-identification label size in px. */
  readonly lineLabelFontSize: number;
  /** Width of the plotting area of a main panel, px. */
  readonly width: number;
  /** Height of a main panel, px. */
  readonly height: number;
  /** Height of a residual panel, px. */
  readonly residualHeight: number;
  /** Height of one row of line labels above a spectrum, px. */
  readonly labelRowHeight: number;
  /** Colours by role. */
  readonly colors: {
    /** Measured data: spectra, data points, velocities. */
    readonly data: string;
    /** Uncertainty band around measured data (drawn translucent). */
    readonly uncertainty: string;
    /** Continuum estimate. */
    readonly continuum: string;
    /** Best-fit model (total). */
    readonly model: string;
    /** Individual model components, in order (repeated when there are more components than colours). */
    readonly components: readonly string[];
    /** A fitted solution drawn as a curve (dispersion solution). */
    readonly solution: string;
    /** Items used in a fit (calibration lines). */
    readonly used: string;
    /** Items rejected from a fit. */
    readonly rejected: string;
    /** Marked spectral lines and their labels. */
    readonly lineMarker: string;
    /** Shaded wavelength intervals (fit windows), drawn translucent. */
    readonly region: string;
    /** Peak or best value marked on a curve. */
    readonly peak: string;
    /** False-alarm levels and other reference levels. */
    readonly reference: string;
    /** Text other than titles (annotations). */
    readonly annotation: string;
    /** Axis lines, ticks and labels. */
    readonly axis: string;
    /** Grid lines. */
    readonly grid: string;
  };
}

/** The theme the builders use. */
export const PLOT_THEME: PlotTheme = Object.freeze({
  fontFamily: 'DejaVu Sans, Verdana, Helvetica, Arial, sans-serif',
  titleFontSize: 15,
  subtitleFontSize: 12,
  axisTitleFontSize: 12,
  labelFontSize: 11,
  lineLabelFontSize: 11,
  width: 640,
  height: 260,
  residualHeight: 100,
  labelRowHeight: 15,
  colors: Object.freeze({
    data: OKABE_ITO.blue,
    uncertainty: OKABE_ITO.skyBlue,
    continuum: OKABE_ITO.bluishGreen,
    model: OKABE_ITO.vermillion,
    components: Object.freeze([OKABE_ITO.orange, OKABE_ITO.reddishPurple, OKABE_ITO.skyBlue, OKABE_ITO.black]),
    solution: '#303030',
    used: OKABE_ITO.blue,
    rejected: OKABE_ITO.vermillion,
    lineMarker: '#5a5a5a',
    region: '#a0a0a0',
    peak: OKABE_ITO.black,
    reference: '#6b6b6b',
    annotation: '#303030',
    axis: '#4d4d4d',
    grid: '#e6e6e6',
  }),
});

/**
 * The Vega-Lite `config` block for `theme`: fonts, axis and legend style, title layout.
 * Every builder puts it in its spec, so a spec looks the same wherever it is rendered.
 *
 * @param theme colours, fonts and sizes; defaults to {@link PLOT_THEME}.
 * @returns a plain object for the spec's `config` property.
 * @example vegaLiteConfig().font; // 'DejaVu Sans, Verdana, Helvetica, Arial, sans-serif'
 */
export function vegaLiteConfig(theme: PlotTheme = PLOT_THEME): Record<string, unknown> {
  const c = theme.colors;
  return {
    font: theme.fontFamily,
    background: 'white',
    padding: 8,
    // Plain decimals without thousands separators (6575.5, not 6,575.5); vega sets the digits from the tick step.
    numberFormat: '~r',
    view: { stroke: null },
    title: {
      anchor: 'start',
      fontSize: theme.titleFontSize,
      fontWeight: 'bold',
      color: '#1a1a1a',
      subtitleFontSize: theme.subtitleFontSize,
      subtitleColor: c.annotation,
      subtitlePadding: 4,
      offset: 10,
    },
    axis: {
      labelFontSize: theme.labelFontSize,
      titleFontSize: theme.axisTitleFontSize,
      titleFontWeight: 'normal',
      titleColor: '#1a1a1a',
      labelColor: c.axis,
      domainColor: c.axis,
      tickColor: c.axis,
      gridColor: c.grid,
      labelFlush: false,
      labelSeparation: 10,
      titlePadding: 8,
    },
    legend: {
      orient: 'top',
      direction: 'horizontal',
      labelFontSize: theme.labelFontSize,
      titleFontSize: theme.labelFontSize,
      titleFontWeight: 'normal',
      symbolStrokeWidth: 2,
      columnPadding: 14,
      labelLimit: 400,
    },
    concat: { spacing: 8 },
    line: { strokeWidth: 1.3 },
    point: { size: 28, filled: true },
    text: { fontSize: theme.lineLabelFontSize, color: c.annotation },
  };
}
