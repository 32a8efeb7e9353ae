import { onRecordHeld } from '../database/record-guard'
import { recordHeld } from '../services/audit'

/** A write refused because a record changed outside Chargewell raises an alert and tells the administrators. */
export default defineNitroPlugin(() => {
  onRecordHeld((held) => {
    recordHeld(held).catch(error => console.error('Could not raise the integrity alert:', error))
  })
})
