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
