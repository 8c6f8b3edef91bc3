// Used by db/cli.ts (migrate, rollback, seed). The app builds the same config in db/client.ts.
import { databaseUrlFromEnv, knexConfig } from "./db/config";

export default knexConfig(databaseUrlFromEnv());
