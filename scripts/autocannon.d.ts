// autocannon ships no types; this is the little of it scripts/bench-load.ts uses.
declare module "autocannon" {
  import type { EventEmitter } from "node:events";
  namespace autocannon {
    interface Client extends EventEmitter {
      setHeaders(headers: Record<string, string>): void;
    }
    interface Options {
      url: string;
      connections?: number;
      /** Requests per second per connection at most (a paced client, not a closed loop). */
      connectionRate?: number;
      duration?: number;
      timeout?: number;
      headers?: Record<string, string>;
      setupClient?: (client: Client) => void;
    }
    interface Result {
      requests: { total: number; average: number };
      non2xx: number;
      errors: number;
      timeouts: number;
    }
    interface Instance extends EventEmitter, PromiseLike<Result> {}
  }
  function autocannon(options: autocannon.Options): autocannon.Instance;
  export default autocannon;
}
