/**
 * The cautions of high-pressure nitrogen work, written once: shown at the charging steps and on
 * the Charge target page, and printed on every record.
 */
export const NITROGEN_CAUTIONS = {
  title: 'Caution: high-pressure nitrogen can kill',
  items: [
    'Use only dry, oil-free nitrogen — never oxygen or shop air.',
    'Depressurise the hydraulic system first: the pre-charge reads true only with the fluid side at zero.',
    'Charge through a regulator, slowly.',
    'Wear eye protection.',
    'Stay clear of the valve line.',
  ],
  governs: 'Every figure here is an aid: the approved maintenance data, the operator\'s procedures and local regulations govern.',
} as const
