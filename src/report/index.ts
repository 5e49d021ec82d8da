// Public API of the report area: self-contained HTML reports, tables, escaping.
export { escapeHtml, inlineSvg } from './html.js';
export { formatCell, isTable, tableHtml, tableText, type Table, type TableCell, type TableColumn, type ValueWithUncertainty } from './table.js';
export {
  INVENTED_DATA_NOTICE,
  SAFETY_CAUTIONS,
  plotBlock,
  reportHtml,
  writeReportFile,
  type ReportBlock,
  type ReportDocument,
  type ReportSection,
} from './document.js';
export { formatMeasured, formatNumber, formatProbability, formatSignificant, observationLabel, observationOf, UNCERTAINTY_SIGNIFICANT_DIGITS, type CellFormat } from './format.js';
export { resultKind, isLibraryResult, type LibraryResult, type ResultKind } from './results/kind.js';
export { summaryText, SUMMARY_MAX_ROWS, type ResultContext, type ResultSummary } from './results/summary.js';
export { summarizeSpectrum, summarizeContinuum } from './results/spectrum.js';
export { summarizeLineFit, summarizeFoundLines, fitQuality } from './results/line-fit.js';
export { summarizeIdentification } from './results/elements.js';
export { summarizeSolution } from './results/calibration.js';
export { summarizeVelocityTable, summarizePeriodogram, summarizeOrbitFit } from './results/orbit.js';
export { summarizeCrossCorrelation, summarizeLineVelocities } from './results/velocity.js';
export { summarizeResult, describeResult } from './results/index.js';
