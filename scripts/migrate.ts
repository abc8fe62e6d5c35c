// Apply the committed migrations as the database owner: DATABASE_OWNER_URL, or DATABASE_URL
// when the deployment has a single role. Then grant the app role (THERMOTOME_APP_DB_ROLE,
// default thermotome_app) its privileges.
import { applyMigrations } from '../server/database/migrate'

const url = process.env.DATABASE_OWNER_URL || process.env.DATABASE_URL
if (!url) {
  console.error('DATABASE_OWNER_URL (or DATABASE_URL) is not set (scripts/postgres.sh url prints the private cluster\'s owner URL).')
  process.exit(1)
}
await applyMigrations(url)
console.log('Migrations applied.')
