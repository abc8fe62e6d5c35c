// Thermotome charts: pure functions from data to an SVG string, a text alternative and a
// table. The same SVG is shown in the browser (v-html; every caller text is escaped here)
// and drawn into the PDF by pdfmake's svg node, so only basic SVG elements and inline
// presentation attributes are used.

export type { ChartOptions, ChartOutput, ChartTable } from './types'
export { populationChart, type PopulationChartData, type PopulationLevel } from './population'
export { temperatureColor, SERIES_COLORS, SERIES_DASHES, DATA as DATA_COLOR, INK as INK_COLOR, FONT_FAMILY } from './palette'
export { formatNumber, formatFromLog10 } from './format'
export { escapeXml } from './xml'
export { sweepChart, type SweepChartData, type SweepSeries } from './sweep'
export { boltzmannPlotChart, type BoltzmannPlotData, type BoltzmannPoint } from './boltzmann'
export { distributionChart, type DistributionChartData } from './distribution'
