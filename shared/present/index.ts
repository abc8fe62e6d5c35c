/**
 * What a person reads of a calculation result: labels in words, symbols, values rounded as a
 * scientist writes them, units, tables, charts and warnings. The block view, the record PDF,
 * the per-calculation CSV and the API's `presentation` field all render from here.
 */
export { describeResultQuantity, resultQuantityAt, parseResultPath, pathText, type ResultPath } from './describe'
export { RESULT_QUANTITIES, type Quantity, type QuantityGroup, type QuantityList } from './quantities'
export { presentResult, LEVEL_TABLE_ROWS_SHOWN, LEVEL_TABLE_CHART_LIMIT } from './result'
export { presentInputs } from './inputs'
export { formatSignificant, formatWithUncertainty, formatFromLog10, formatInteger, significantFigures, DEFAULT_SIGNIFICANT_FIGURES } from './numbers'
export { columnHeader, type Presentation, type PresentedRow, type PresentedSection, type PresentedTable, type PresentedColumn, type PresentedChart, type PresentPreferences } from './types'
export { presentedTableCsv } from './csv'
