import { inflateSync } from 'node:zlib'

/**
 * A WOFF 1.0 font as the plain TrueType/OpenType (sfnt) file it wraps (W3C, "WOFF File Format 1.0", §3–§5):
 * each table inflated once. fontkit inflates a WOFF's tables again on every read, which made each record PDF
 * spend most of its time in zlib; the PDF writer hands it the sfnt instead. Any other file is returned as is.
 */
export function sfntFromWoff(bytes: Uint8Array): Uint8Array {
  const input = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength)
  if (input.length < 44 || input.toString('latin1', 0, 4) !== 'wOFF') return bytes
  const flavor = input.readUInt32BE(4)
  const numTables = input.readUInt16BE(12)
  const tables = Array.from({ length: numTables }, (_, index) => {
    const at = 44 + index * 20
    const offset = input.readUInt32BE(at + 4)
    const compLength = input.readUInt32BE(at + 8)
    const origLength = input.readUInt32BE(at + 12)
    const stored = input.subarray(offset, offset + compLength)
    return {
      tag: input.subarray(at, at + 4),
      checksum: input.readUInt32BE(at + 16),
      data: compLength < origLength ? inflateSync(stored) : stored,
    }
  })
  let power = 1
  while (power * 2 <= numTables) power *= 2
  const headerLength = 12 + numTables * 16
  const padded = (length: number) => (length + 3) & ~3
  const output = Buffer.alloc(headerLength + tables.reduce((sum, table) => sum + padded(table.data.length), 0))
  output.writeUInt32BE(flavor, 0)
  output.writeUInt16BE(numTables, 4)
  output.writeUInt16BE(power * 16, 6)
  output.writeUInt16BE(Math.log2(power), 8)
  output.writeUInt16BE(numTables * 16 - power * 16, 10)
  let offset = headerLength
  tables.forEach((table, index) => {
    const record = 12 + index * 16
    table.tag.copy(output, record)
    output.writeUInt32BE(table.checksum, record + 4)
    output.writeUInt32BE(offset, record + 8)
    output.writeUInt32BE(table.data.length, record + 12)
    table.data.copy(output, offset)
    offset += padded(table.data.length)
  })
  return new Uint8Array(output.buffer, output.byteOffset, output.byteLength)
}
