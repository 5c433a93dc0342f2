/** Fails fast, naming the variable, when the environment is invalid (run by `npm start` and `npm test`). */
import { EnvError, parseEnv } from "./env";

try {
  parseEnv();
} catch (err) {
  console.error(err instanceof EnvError ? err.message : err);
  process.exit(1);
}
