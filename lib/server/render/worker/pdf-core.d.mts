/** Types of pdf-core.mjs. */

export interface PdfJob {
  widthPt: number;
  heightPt: number;
  title?: string;
  subject?: string;
  creationDate?: Date;
}

export declare function svgToPdfCore(svg: string, o: PdfJob): Promise<Uint8Array>;
