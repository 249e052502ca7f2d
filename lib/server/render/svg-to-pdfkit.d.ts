// svg-to-pdfkit 0.1.8 ships no types; only the options Prooflight uses are declared.
declare module "svg-to-pdfkit" {
  interface SvgToPdfOptions {
    width?: number;
    height?: number;
    preserveAspectRatio?: string;
    assumePt?: boolean;
    precision?: number;
    useCSS?: boolean;
    fontCallback?: (family: string, bold: boolean, italic: boolean, fontOptions: { fauxBold: boolean; fauxItalic: boolean }) => string;
    imageCallback?: (link: string) => string | Buffer;
    documentCallback?: (file: string) => unknown;
    warningCallback?: (message: string) => void;
  }
  function SVGtoPDF(doc: PDFKit.PDFDocument, svg: string, x?: number, y?: number, options?: SvgToPdfOptions): void;
  export default SVGtoPDF;
}
