// pdfmake 0.3 ships no type declarations; these cover the parts the PDF renderer uses.
declare module 'pdfmake' {
  interface OutputDocument { getBuffer(): Promise<Buffer> }
  interface PdfMake {
    virtualfs: { writeFileSync(name: string, data: Buffer): void, existsSync(name: string): boolean }
    setFonts(fonts: Record<string, Record<'normal' | 'bold' | 'italics' | 'bolditalics', string>>): void
    setUrlAccessPolicy(policy: (url: string) => boolean): void
    setLocalAccessPolicy(policy: (path: string) => boolean): void
    addTableLayouts(layouts: Record<string, Record<string, unknown>>): void
    createPdf(definition: Record<string, unknown>, options?: Record<string, unknown>): OutputDocument
  }
  const pdfmake: PdfMake
  export default pdfmake
}
declare module 'pdfmake/js/PDFDocument.js' {
  const PDFDocument: { prototype: Record<string, any> }
  export default PDFDocument
}
