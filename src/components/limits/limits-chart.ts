// The completeness map, its CSV table and the non-detection sentence live in shared/report/limits.ts
// (the PDF draws the same map); re-exported here for the limits panel.
export { fractionColour, limitsChartOption, limitsTableCsv, logEdges, nonDetectionSentence } from '@shared/report/limits.ts'
