// Keeping a local service up under `npm start`: when one dies on its own it is started again after
// a pause that doubles with each quick failure (1 s, 2 s, 4 s … at most 30 s) and goes back to
// 1 s once a run has stayed up a minute, with a line in the log each time. One dying service no
// longer takes the others down; Ctrl-C still stops everything (the run calls stop()).

export const RESTART_POLICY = { baseMs: 1_000, maxMs: 30_000, stableMs: 60_000 };

/** The pause before restart number `failures + 1` of a service that keeps failing quickly. */
export function restartDelay(failures, { baseMs, maxMs } = RESTART_POLICY) {
  return Math.min(maxMs, baseMs * 2 ** Math.min(failures, 30));
}

const describe = ({ code, signal, error, reason }) =>
  error ? `failed to start: ${error.message.split("\n")[0]}` : reason ?? (signal ? `killed by ${signal}` : `exit ${code}`);

/**
 * Runs a service and restarts it when it ends while the run is still on. `start()` starts one
 * instance and resolves once that instance has ended (`{ code, signal }` or `{ reason }`); when it
 * throws (the service couldn't be started at all) that counts as a quick failure too.
 */
export class Restarter {
  #stopped = false;
  #wake = null;
  /** Quick failures in a row: what the next pause is computed from. */
  failures = 0;
  /** How many times the service was started, the first time included. */
  starts = 0;

  constructor({ name, start, policy = RESTART_POLICY, log = (line) => console.error(line) }) {
    this.name = name;
    this.start = start;
    this.policy = policy;
    this.log = log;
    this.done = this.#loop();
  }

  async #loop() {
    while (!this.#stopped) {
      const startedAt = Date.now();
      this.starts += 1;
      let outcome;
      try {
        outcome = await this.start();
      } catch (error) {
        outcome = { error };
      }
      if (this.#stopped) return;
      // A run that stayed up a while was not a crash loop: the next pause starts short again.
      if (Date.now() - startedAt >= this.policy.stableMs) this.failures = 0;
      const delay = restartDelay(this.failures, this.policy);
      this.failures += 1;
      this.log(`${this.name} stopped unexpectedly (${describe(outcome ?? {})}); restarting it in ${formatDelay(delay)}.`);
      await new Promise((resolve) => {
        const timer = setTimeout(resolve, delay);
        this.#wake = () => (clearTimeout(timer), resolve());
      });
      this.#wake = null;
    }
  }

  /** No more restarts; the caller stops the running instance (Run.stop stops every child). */
  stop() {
    this.#stopped = true;
    this.#wake?.();
  }
}

function formatDelay(ms) {
  return ms >= 1000 ? `${Math.round(ms / 100) / 10} s` : `${ms} ms`;
}
