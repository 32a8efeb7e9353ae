import { PDFDocument, StandardFonts, rgb, type PDFFont, type PDFPage } from 'pdf-lib'

/** The standard PDF fonts encode WinAnsi only: map the few characters outside it. */
export function printable(text: string): string {
  return text
    .replace(/[−–—]/g, '-').replace(/[‘’]/g, '\'').replace(/[“”]/g, '"').replace(/³/g, '3').replace(/ⁿ/g, '^n')
    .replace(/→/g, '->').replace(/≤/g, '<=').replace(/≥/g, '>=').replace(/[^\n\r\x20-\x7E\xA0-\xFF]/g, '?')
}

/** A4 pages of wrapped text with headings: all Chargewell's PDF reports need. */
export class PdfWriter {
  private page!: PDFPage
  private y = 0
  private readonly margin = 50

  private constructor(private readonly document: PDFDocument, private readonly regular: PDFFont, private readonly bold: PDFFont) {
    this.newPage()
  }

  static async create(title: string): Promise<PdfWriter> {
    const document = await PDFDocument.create()
    document.setTitle(title)
    document.setCreator('Chargewell')
    return new PdfWriter(document, await document.embedFont(StandardFonts.Helvetica), await document.embedFont(StandardFonts.HelveticaBold))
  }

  private newPage() {
    this.page = this.document.addPage([595.28, 841.89])
    this.y = this.page.getHeight() - this.margin
  }

  write(text: string, options: { bold?: boolean, size?: number, gap?: number, colour?: [number, number, number] } = {}): void {
    const font = options.bold ? this.bold : this.regular
    const size = options.size ?? 10
    const width = this.page.getWidth() - 2 * this.margin
    const lines: string[] = []
    let line = ''
    for (const word of printable(text).split(' ')) {
      const candidate = line ? `${line} ${word}` : word
      if (font.widthOfTextAtSize(candidate, size) > width && line) {
        lines.push(line)
        line = `   ${word}`
      }
      else line = candidate
    }
    lines.push(line)
    for (const text of lines) {
      if (this.y < this.margin + size) this.newPage()
      this.page.drawText(text, { x: this.margin, y: this.y, size, font, color: rgb(...(options.colour ?? [0.04, 0.16, 0.19])) })
      this.y -= size * 1.35
    }
    this.y -= options.gap ?? 0
  }

  heading(text: string): void {
    this.y -= 6
    this.write(text, { bold: true, size: 12, gap: 2 })
  }

  save(): Promise<Uint8Array> {
    return this.document.save()
  }
}

export const CAUTIONS = [
  'High-pressure nitrogen can kill.',
  'Use only dry, oil-free nitrogen - never oxygen or shop air.',
  'Depressurise the hydraulic system first.',
  'Charge through a regulator, slowly. Wear eye protection. Stay clear of the valve line.',
  'Every figure is an aid: the approved maintenance data, the operator\'s procedures and local regulations govern.',
]
