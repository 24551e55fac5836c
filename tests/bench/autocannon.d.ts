// autocannon 9 ships no types; only what tests/bench uses is declared.
declare module 'autocannon' {
  interface Options {
    url: string;
    connections?: number;
    duration?: number;
    method?: string;
    headers?: Record<string, string>;
    body?: string;
  }
  interface Result {
    requests: { total: number; average: number };
    errors: number;
    non2xx: number;
  }
  interface Instance extends PromiseLike<Result> {
    on(event: 'response', listener: (client: unknown, statusCode: number, resBytes: number, responseTime: number) => void): this;
  }
  function autocannon(opts: Options): Instance;
  export default autocannon;
}
