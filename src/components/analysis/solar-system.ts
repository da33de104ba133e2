// Solar System planets for the period–mass chart: sidereal orbital periods in days and masses in
// Earth masses, rounded. Standard planetary fact-sheet values, written from memory (common practice
// reference values; good to the few per cent the chart can show).
export interface ReferencePlanet { name: string; periodDays: number; massEarth: number }

export const SOLAR_SYSTEM: ReferencePlanet[] = [
  { name: 'Mercury', periodDays: 87.97, massEarth: 0.0553 },
  { name: 'Venus', periodDays: 224.7, massEarth: 0.815 },
  { name: 'Earth', periodDays: 365.26, massEarth: 1 },
  { name: 'Mars', periodDays: 686.98, massEarth: 0.107 },
  { name: 'Jupiter', periodDays: 4332.6, massEarth: 317.8 },
  { name: 'Saturn', periodDays: 10759, massEarth: 95.2 },
  { name: 'Uranus', periodDays: 30689, massEarth: 14.5 },
  { name: 'Neptune', periodDays: 60190, massEarth: 17.1 },
]
