// The few parts of autocannon's programmatic API the load benchmarks use (it ships no types).
declare module "autocannon" {
  export interface Request {
    method?: "GET" | "POST";
    path?: string;
    headers?: Record<string, string>;
    body?: string;
    setupRequest?: (
      req: { path: string; body?: string; [k: string]: unknown },
      context: Record<string, any>,
    ) => unknown;
    onResponse?: (
      status: number,
      body: string,
      context: Record<string, any>,
      headers: Record<string, string>,
    ) => void;
  }
  export interface Options {
    url: string;
    connections?: number;
    duration?: number;
    pipelining?: number;
    requests?: Request[];
  }
  export interface Result {
    duration: number;
    non2xx: number;
    errors: number;
    timeouts: number;
  }
  export interface Instance extends PromiseLike<Result> {
    on(
      event: "response",
      fn: (client: unknown, status: number, bytes: number, ms: number) => void,
    ): void;
  }
  export default function autocannon(options: Options): Instance;
}
