/** Public API of the next-observation planner (re-exports only). */
export { type Site, type StarPosition, type SkyState, skyAt, airmass, altitudeForAirmass, observerOf, jdToDate, dateToJd, checkSite, checkStarPosition } from './sky.ts'
export {
  type ObservingLimits, type RejectReason, type Slot, type SlotGrid, type NightWindow,
  OBSERVING_DEFAULTS, MAX_SLOTS, resolveLimits, slotTimes, judgeSlot, observabilitySlots, nightWindows,
} from './observability.ts'
