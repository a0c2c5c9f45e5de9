// The part of autocannon 9's API the benchmarks use (the package ships no types).
declare module 'autocannon' {
  import type { EventEmitter } from 'node:events';

  namespace autocannon {
    interface Request {
      method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
      path?: string;
      headers?: Record<string, string>;
      body?: string | Buffer;
      /** Per request, with the connection's context; returns the request to send. */
      setupRequest?: (req: Request, context: any) => Request;
      onResponse?: (status: number, body: string, context: any) => void;
    }
    interface Options {
      url: string;
      connections?: number;
      duration?: number;
      /** seconds */
      timeout?: number;
      requests?: Request[];
    }
    interface Result {
      errors: number;
      timeouts: number;
      non2xx: number;
      latency: Record<string, number>;
    }
    interface Instance extends EventEmitter, PromiseLike<Result> {}
  }
  function autocannon(opts: autocannon.Options): autocannon.Instance;
  export default autocannon;
}
