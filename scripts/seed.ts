// Seed the demo lab into an empty database, then print the sign-in details.
import { DEMO_PASSWORD, DEMO_PEOPLE } from '../shared/demo'
import { seedDemoLab } from '../server/database/seed'

// The seed writes as the owner (DATABASE_OWNER_URL), like the migrations.
const url = process.env.DATABASE_OWNER_URL || process.env.DATABASE_URL
if (!url) {
  console.error('DATABASE_OWNER_URL (or DATABASE_URL) is not set.')
  process.exit(1)
}
const seeded = await seedDemoLab(url)
console.log(seeded ? 'Demo lab seeded.' : 'Database already has people; demo lab not seeded again.')
console.log('\nDemo sign-in (fictional Kestrel Ridge lab), password for everyone:', DEMO_PASSWORD)
for (const person of DEMO_PEOPLE)
  console.log(`  ${person.email.padEnd(42)} ${person.roles.join(', ')}`)
