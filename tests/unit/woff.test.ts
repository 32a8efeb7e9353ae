/**
 * WOFF 1.0 to sfnt (W3C "WOFF File Format 1.0"): the shipped Source Sans 3 files, unwrapped, are the same
 * font to fontkit (the same characters, glyph count and metrics) as the WOFF itself.
 */
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import fontkit from '@pdf-lib/fontkit'
import { describe, expect, it } from 'vitest'
import { sfntFromWoff } from '../../server/utils/woff'

const FILES = join(import.meta.dirname, '../../node_modules/@fontsource/source-sans-3/files')

describe('sfntFromWoff', () => {
  it.each(['latin-400', 'latin-700', 'greek-400', 'cyrillic-ext-700'])('unwraps source-sans-3-%s-normal.woff', (name) => {
    const woff = new Uint8Array(readFileSync(join(FILES, `source-sans-3-${name}-normal.woff`)))
    const sfnt = sfntFromWoff(woff)
    expect(Buffer.from(sfnt.subarray(0, 4)).toString('latin1')).not.toBe('wOFF')
    const [a, b] = [fontkit.create(Buffer.from(woff)), fontkit.create(Buffer.from(sfnt))]
    expect(b.numGlyphs).toBe(a.numGlyphs)
    expect(b.characterSet).toEqual(a.characterSet)
    expect(b.unitsPerEm).toBe(a.unitsPerEm)
    expect(b.layout('Pre-charge 1 000 psi').advanceWidth).toBe(a.layout('Pre-charge 1 000 psi').advanceWidth)
  })

  it('leaves a file that is not WOFF as it is', () => {
    const ttf = new Uint8Array([0, 1, 0, 0, 1, 2, 3])
    expect(sfntFromWoff(ttf)).toBe(ttf)
  })
})
