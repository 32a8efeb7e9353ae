import fontkit from '@pdf-lib/fontkit'
import type { H3Event } from 'h3'
import { PDFDocument, rgb, type PDFFont } from 'pdf-lib'
import { sfntFromWoff } from './woff'

/**
 * A4 pages of wrapped text with headings: all Chargewell's PDF reports need. A signed record
 * must keep every character a person typed, so the text is drawn in fonts shipped with the
 * app (bundled as server assets, see nuxt.config.ts): Source Sans 3, the app's own face, in its
 * Latin, Greek, Cyrillic and Vietnamese subsets, then DejaVu Sans for whatever those lack
 * (symbols, other scripts). Only the glyphs used are embedded. A character no shipped font can
 * draw is printed as [U+XXXX] and the record says so at its end — never silently dropped.
 */
const SOURCE_SANS_SUBSETS = ['latin', 'latin-ext', 'greek', 'greek-ext', 'cyrillic', 'cyrillic-ext', 'vietnamese']
const FACES = {
  regular: [
    ...SOURCE_SANS_SUBSETS.map(subset => `pdf-fonts:source-sans-3-${subset}-400-normal.woff`),
    'pdf-fonts-fallback:DejaVuSans.ttf',
  ],
  bold: [
    ...SOURCE_SANS_SUBSETS.map(subset => `pdf-fonts:source-sans-3-${subset}-700-normal.woff`),
    'pdf-fonts-fallback:DejaVuSans-Bold.ttf',
  ],
}
type Face = keyof typeof FACES

interface FontFile {
  key: string
  bytes: Uint8Array
  codePoints: Set<number>
}
let fontFiles: Promise<Record<Face, FontFile[]>> | undefined

/**
 * fontkit for pdf-lib, parsing each shipped font file once per process instead of once per document (a WOFF
 * file is inflated on every parse): half the time of a record PDF went there, and a bulk export makes
 * thousands. Each document still takes its own subset of the glyphs it uses.
 */
const parsedFonts = new WeakMap<Uint8Array, ReturnType<typeof fontkit.create>>()
const fontkitOnce: typeof fontkit = {
  create(data: Uint8Array, postscriptName?: string) {
    if (postscriptName) return fontkit.create(data, postscriptName)
    let font = parsedFonts.get(data)
    if (!font) {
      font = withRememberedLayouts(fontkit.create(data))
      parsedFonts.set(data, font)
    }
    return font
  },
}

/** How many laid-out pieces of text each font keeps (the glyphs only: references to the font's own). */
const LAYOUTS_KEPT = 2_000

/**
 * pdf-lib lays text out (OpenType shaping) to draw it and again to measure it, and reads only the glyphs
 * of the result: a font parsed once per process keeps the glyphs of the pieces it has laid out, the
 * oldest forgotten first, so the words and labels every record repeats are shaped once.
 */
function withRememberedLayouts<Font extends ReturnType<typeof fontkit.create>>(font: Font): Font {
  const layout = font.layout.bind(font)
  const kept = new Map<string, { glyphs: ReturnType<typeof layout>['glyphs'] }>()
  font.layout = ((text: string, features?: never) => {
    if (features !== undefined) return layout(text, features)
    let run = kept.get(text)
    if (!run) {
      run = { glyphs: layout(text).glyphs }
      if (kept.size >= LAYOUTS_KEPT) kept.delete(kept.keys().next().value!)
      kept.set(text, run)
    }
    return run
  }) as never
  return font
}

/** The shipped font files with the characters each covers, read once per process. */
function loadFontFiles(): Promise<Record<Face, FontFile[]>> {
  fontFiles ??= (async () => {
    const load = async (key: string): Promise<FontFile> => {
      const [base, name] = key.split(':') as [string, string]
      const raw = await useStorage(`assets:${base}`).getItemRaw<Uint8Array | Buffer>(name)
      if (!raw) throw new Error(`The PDF font ${name} is missing from the server build.`)
      // Unwrapped once: fontkit would inflate a WOFF's tables again on every read, in every PDF.
      const bytes = sfntFromWoff(new Uint8Array(raw))
      return { key, bytes, codePoints: new Set(fontkit.create(Buffer.from(bytes)).characterSet) }
    }
    return { regular: await Promise.all(FACES.regular.map(load)), bold: await Promise.all(FACES.bold.map(load)) }
  })().catch((error) => {
    fontFiles = undefined
    throw error
  })
  return fontFiles
}

interface Block {
  kind?: 'text'
  text: string
  face: Face
  size: number
  gap: number
  colour: [number, number, number]
  spaceBefore: number
}
interface ImageBlock {
  kind: 'image'
  bytes: Uint8Array
  mimeType: string
  maxWidth: number
  maxHeight: number
}
interface QrBlock {
  kind: 'qr'
  /** Dark (1) and light (0) modules, row by row, of a square `size` modules wide. */
  modules: ArrayLike<number>
  size: number
  width: number
}
interface Attachment {
  name: string
  bytes: Uint8Array
  mimeType: string
  description: string
}
interface Run {
  text: string
  file: FontFile
}

const INK: [number, number, number] = [0.04, 0.16, 0.19]
const MARGIN = 50
const A4: [number, number] = [595.28, 841.89]

export class PdfWriter {
  private readonly blocks: (Block | ImageBlock | QrBlock)[] = []
  private readonly attachments: Attachment[] = []
  private footerOf?: (page: number, pages: number) => string

  private constructor(private readonly title: string) {}

  static async create(title: string): Promise<PdfWriter> {
    return new PdfWriter(title)
  }

  write(
    text: string,
    options: { bold?: boolean, size?: number, gap?: number, colour?: [number, number, number] } = {},
  ): void {
    this.blocks.push({
      text,
      face: options.bold ? 'bold' : 'regular',
      size: options.size ?? 10,
      gap: options.gap ?? 0,
      colour: options.colour ?? INK,
      spaceBefore: 0,
    })
  }

  /** A JPEG or PNG drawn at most `maxWidth` × `maxHeight` points, on the next page if it does not fit. */
  image(bytes: Uint8Array, mimeType: string, options: { maxWidth?: number, maxHeight?: number } = {}): void {
    this.blocks.push({ kind: 'image', bytes, mimeType, maxWidth: options.maxWidth ?? 260, maxHeight: options.maxHeight ?? 220 })
  }

  /**
   * A QR code `width` points wide, drawn as squares (vector: sharp at any zoom, and no image to encode
   * and decode again in every record), with a quiet zone of one module.
   */
  qrCode(modules: ArrayLike<number>, size: number, width = 84): void {
    this.blocks.push({ kind: 'qr', modules, size, width })
  }

  /** A file embedded in the PDF (its attachments panel), e.g. the record's content as JSON. */
  attach(name: string, bytes: Uint8Array, mimeType: string, description: string): void {
    this.attachments.push({ name, bytes, mimeType, description })
  }

  /** A line at the foot of every page, given its number and the count: "Worksheet 12 · page 1 of 3". */
  footer(text: (page: number, pages: number) => string): void {
    this.footerOf = text
  }

  heading(text: string): void {
    this.blocks.push({ text, face: 'bold', size: 12, gap: 2, colour: INK, spaceBefore: 6 })
  }

  async save(): Promise<Uint8Array> {
    const files = await loadFontFiles()
    const document = await PDFDocument.create()
    document.registerFontkit(fontkitOnce)
    document.setTitle(this.title)
    document.setCreator('Chargewell')
    const embedded = new Map<string, PDFFont>()
    const fontFor = async (file: FontFile) => {
      let font = embedded.get(file.key)
      if (!font) {
        font = await document.embedFont(file.bytes, { subset: true })
        embedded.set(file.key, font)
      }
      return font
    }
    const undrawable = new Set<number>()
    // Each character goes to the first shipped font that has it; runs of the same font are drawn together.
    const runsOf = (text: string, face: Face): Run[] => {
      const runs: Run[] = []
      for (const character of text) {
        const codePoint = character.codePointAt(0)!
        let file = files[face].find(candidate => candidate.codePoints.has(codePoint))
        let piece = character
        if (!file) {
          undrawable.add(codePoint)
          piece = `[U+${codePoint.toString(16).toUpperCase().padStart(4, '0')}]`
          file = files[face][0]!
        }
        const last = runs.at(-1)
        if (last && last.file === file) last.text += piece
        else runs.push({ text: piece, file })
      }
      return runs
    }
    const widthOf = async (runs: Run[], size: number) => {
      let width = 0
      for (const run of runs) width += (await fontFor(run.file)).widthOfTextAtSize(run.text, size)
      return width
    }

    let page = document.addPage(A4)
    let y = A4[1] - MARGIN
    const width = A4[0] - 2 * MARGIN
    const draw = async (block: Block) => {
      y -= block.spaceBefore
      for (const paragraph of block.text.split(/\r?\n/)) {
        // Each word is measured once (with the space before it) and a line's width is the sum: measuring the
        // whole line again for every word shaped it word by word over and over (two thirds of a record's PDF).
        const lines: string[] = []
        let line = ''
        let lineWidth = 0
        for (const word of paragraph.split(' ')) {
          if (!line) {
            line = word
            lineWidth = await widthOf(runsOf(word, block.face), block.size)
            continue
          }
          const added = await widthOf(runsOf(` ${word}`, block.face), block.size)
          if (lineWidth + added > width) {
            lines.push(line)
            line = `   ${word}`
            lineWidth = await widthOf(runsOf(line, block.face), block.size)
          }
          else {
            line = `${line} ${word}`
            lineWidth += added
          }
        }
        lines.push(line)
        for (const text of lines) {
          if (y < MARGIN + block.size) {
            page = document.addPage(A4)
            y = A4[1] - MARGIN
          }
          let x = MARGIN
          for (const run of runsOf(text, block.face)) {
            const font = await fontFor(run.file)
            page.drawText(run.text, { x, y, size: block.size, font, color: rgb(...block.colour) })
            x += font.widthOfTextAtSize(run.text, block.size)
          }
          y -= block.size * 1.35
        }
      }
      y -= block.gap
    }
    const drawImage = async (block: ImageBlock) => {
      let image
      try {
        image = block.mimeType === 'image/png' ? await document.embedPng(block.bytes) : await document.embedJpg(block.bytes)
      }
      catch (error) {
        // A file that is not the image it says it is: said in the record, never a failed record.
        await draw({
          text: `(This image could not be drawn: ${(error as Error).message.split('\n')[0]})`,
          face: 'regular', size: 10, gap: 0, colour: [0.55, 0.1, 0.07], spaceBefore: 0,
        })
        return
      }
      const scale = Math.min(1, block.maxWidth / image.width, block.maxHeight / image.height)
      const [w, h] = [image.width * scale, image.height * scale]
      if (y - h < MARGIN) {
        page = document.addPage(A4)
        y = A4[1] - MARGIN
      }
      page.drawImage(image, { x: MARGIN, y: y - h, width: w, height: h })
      y -= h + 14
    }
    const drawQrCode = (block: QrBlock) => {
      const module = block.width / (block.size + 2)
      if (y - block.width < MARGIN) {
        page = document.addPage(A4)
        y = A4[1] - MARGIN
      }
      // One path of a square per dark module, in the path's own units (one per module), y downwards.
      const squares: string[] = []
      for (let row = 0; row < block.size; row++) {
        for (let column = 0; column < block.size; column++)
          if (block.modules[row * block.size + column]) squares.push(`M${column + 1} ${row + 1}h1v1h-1z`)
      }
      page.drawSvgPath(squares.join(''), { x: MARGIN, y, scale: module, color: rgb(0, 0, 0), borderWidth: 0 })
      // Clear of the next line's capitals (text is drawn on its baseline).
      y -= block.width + 14
    }
    for (const block of this.blocks) {
      if (block.kind === 'image') await drawImage(block)
      else if (block.kind === 'qr') drawQrCode(block)
      else await draw(block)
    }
    if (undrawable.size > 0) {
      await draw({
        text: 'Some characters in this record could not be drawn with the fonts Chargewell ships; each is shown as [U+code], its Unicode number, so nothing was dropped.',
        face: 'bold',
        size: 10,
        gap: 0,
        colour: [0.55, 0.1, 0.07],
        spaceBefore: 10,
      })
    }
    if (this.footerOf) {
      const pages = document.getPages()
      for (const [index, each] of pages.entries()) {
        let x = MARGIN
        for (const run of runsOf(this.footerOf(index + 1, pages.length), 'regular')) {
          const font = await fontFor(run.file)
          each.drawText(run.text, { x, y: 24, size: 8, font, color: rgb(...INK) })
          x += font.widthOfTextAtSize(run.text, 8)
        }
      }
    }
    for (const attachment of this.attachments) {
      await document.attach(attachment.bytes, attachment.name, {
        mimeType: attachment.mimeType,
        description: attachment.description,
      })
    }
    return document.save()
  }
}

/** A PDF as a download named chargewell-<name>.pdf. */
export function sendPdf(event: H3Event, name: string, bytes: Uint8Array): Buffer {
  setResponseHeader(event, 'content-type', 'application/pdf')
  setResponseHeader(event, 'content-disposition', `attachment; filename="chargewell-${name}.pdf"`)
  return Buffer.from(bytes)
}
