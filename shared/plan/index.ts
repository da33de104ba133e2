/** Public API of the next-observation planner (re-exports only). */
export { type Site, type StarPosition, type SkyState, skyAt, airmass, altitudeForAirmass, observerOf, jdToDate, dateToJd, checkSite, checkStarPosition } from './sky.ts'
export {
  type ObservingLimits, type RejectReason, type Slot, type SlotGrid, type NightWindow,
  OBSERVING_DEFAULTS, MAX_SLOTS, resolveLimits, slotTimes, judgeSlot, observabilitySlots, nightWindows,
} from './observability.ts'
export {
  type PosteriorDraws, type NamedSample,
  drawCount, predictDraws, predictiveSpread, informationFromVariance, expectedInformation, expectedInformationDirect,
  predictiveBand, drawsFromSample,
} from './information.ts'
export { type PlanOptions, type Recommendation, type PlanResult, TIME_NOTE, pickSpaced, plan } from './schedule.ts'
export { type CalendarOptions, PLAN_CSV_COLUMNS, planToCsv, planToIcs, icsEscape, icsFold, icsDateTime } from './export.ts'
