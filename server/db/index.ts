export { createSequelize, warmPool } from './sequelize.ts'
export { createMigrator } from './migrate.ts'
export { initModels, type Models } from './models.ts'
export * as models from './models.ts'
