/** A chart's series is bounded whatever the history: the baseline and the latest are always kept. */
import { describe, expect, it } from 'vitest'
import { downsample, SERIES_POINTS } from '../../shared/utils/cycle-check'

describe('downsampling a system\'s checks for a chart', () => {
  it('keeps a short series whole', () => {
    const series = Array.from({ length: 12 }, (_, index) => index)
    expect(downsample(series)).toEqual(series)
  })

  it('cuts ten years of weekly checks to 60 points, keeping the first three and the latest, in order', () => {
    const series = Array.from({ length: 520 }, (_, index) => index)
    const shown = downsample(series)
    expect(shown).toHaveLength(SERIES_POINTS)
    expect(shown.slice(0, 3)).toEqual([0, 1, 2])
    expect(shown.at(-1)).toBe(519)
    expect([...shown].sort((a, b) => a - b)).toEqual(shown)
    expect(new Set(shown).size).toBe(shown.length)
  })
})
