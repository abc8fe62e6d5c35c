/**
 * Makes the organisation's records key when it is missing (npm start and the tests run this):
 *   npx tsx scripts/records-key.ts
 * The key file is THERMOTOME_RECORDS_KEY_FILE or $THERMOTOME_DATA_DIR/records-key.pem (PKCS #8,
 * mode 600). Keep it outside the database and its backups; publish its public half (printed).
 */
import { ensureRecordsKey, recordsKeyPath } from '../server/utils/recordsKey'

const path = recordsKeyPath()
const { key, created } = ensureRecordsKey(path)
console.log(`${created ? 'made' : 'kept'} the records key ${path}`)
console.log(`records key fingerprint (SHA-256 of the raw public key): ${key.fingerprint}`)
