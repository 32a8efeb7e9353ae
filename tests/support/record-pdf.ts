import type { PDFString, PDFHexString, PDFRawStream } from 'pdf-lib'
import { PDFArray, PDFDict, PDFDocument, PDFName, decodePDFRawStream } from 'pdf-lib'

/** The PDF's embedded files' specifications by name (a record carries its content and signatures so). */
function embeddedFiles(document: PDFDocument): Map<string, PDFDict> {
  const names = document.catalog.lookup(PDFName.of('Names'), PDFDict)
  const tree = names.lookup(PDFName.of('EmbeddedFiles'), PDFDict)
  const list = tree.lookup(PDFName.of('Names'), PDFArray)
  const files = new Map<string, PDFDict>()
  for (let index = 0; index < list.size(); index += 2) {
    const name = list.lookup(index) as PDFString | PDFHexString
    files.set(name.decodeText(), list.lookup(index + 1, PDFDict))
  }
  return files
}

/** An embedded JSON file of a record PDF, parsed. */
export async function readEmbeddedJson<T>(bytes: Uint8Array, name: string): Promise<T> {
  const document = await PDFDocument.load(bytes)
  const spec = embeddedFiles(document).get(name)!
  const stream = spec.lookup(PDFName.of('EF'), PDFDict).lookup(PDFName.of('F')) as PDFRawStream
  return JSON.parse(new TextDecoder().decode(decodePDFRawStream(stream).decode())) as T
}

/** The record PDF with one embedded JSON file changed, as someone editing the file would change it. */
export async function withEmbeddedJson<T>(
  bytes: Uint8Array,
  name: string,
  change: (value: T) => void,
): Promise<Uint8Array> {
  const value = await readEmbeddedJson<T>(bytes, name)
  change(value)
  const document = await PDFDocument.load(bytes)
  const spec = embeddedFiles(document).get(name)!
  const stream = document.context.flateStream(new TextEncoder().encode(JSON.stringify(value)), { Type: 'EmbeddedFile', Subtype: 'application/json' })
  spec.lookup(PDFName.of('EF'), PDFDict).set(PDFName.of('F'), document.context.register(stream))
  return document.save()
}
