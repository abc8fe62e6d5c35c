// Apply the committed migrations to DATABASE_URL.
import { applyMigrations } from '../server/database/migrate'

const url = process.env.DATABASE_URL
if (!url) {
  console.error('DATABASE_URL is not set (scripts/postgres.sh url prints the private cluster\'s).')
  process.exit(1)
}
await applyMigrations(url)
console.log('Migrations applied.')
