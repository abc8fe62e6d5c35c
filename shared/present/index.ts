/**
 * What a person reads of a calculation result: labels in words, symbols, values rounded as a
 * scientist writes them, units, tables, charts and warnings. The block view, the record PDF,
 * the per-calculation CSV and the API's `presentation` field all render from here.
 */
export { describeResultQuantity, resultQuantityAt, parseResultPath, pathText, type ResultPath } from './describe'
export { RESULT_QUANTITIES, type Quantity, type QuantityGroup, type QuantityList } from './quantities'
