// Used by db/cli.ts (migrate, rollback, seed). The app builds the same config in lib/server/db.ts.
import { databaseUrlFromEnv, knexConfig } from "./lib/server/db-config";

export default knexConfig(databaseUrlFromEnv());
