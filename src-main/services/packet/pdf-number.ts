/** A number as pdfkit writes it into page content: rounded to six decimals (its PDFObject.number). */
export const pdfNumber = (n: number): number => Math.round(n * 1e6) / 1e6;
