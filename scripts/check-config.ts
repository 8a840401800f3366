// Refuse to start with settings that cannot work (production: APP_SECRET, SMTP_URL, APP_URL).
import { authConfig, ConfigError } from '../src/server/config';

try {
  authConfig();
} catch (err) {
  if (err instanceof ConfigError) {
    console.error(`[platewright] ${err.message}`);
    process.exit(1);
  }
  throw err;
}
