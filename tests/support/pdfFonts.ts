// The PDF fonts straight from node_modules, for tests and benchmarks that render outside Nitro.
export { pdfFontFilesFromNodeModules, pdfFontLoaderFromNodeModules } from '../../server/pdf/nodeFonts'
