// Runs once before all test files. The database helper (tests/helpers/db.ts) prepares a migrated
// template database here when TEST_DATABASE_URL is set; each API test file then clones it.
export default async function setup(): Promise<void> {
  if (!process.env.TEST_DATABASE_URL) return
  const { prepareTemplate } = await import('./db.ts')
  await prepareTemplate()
}
