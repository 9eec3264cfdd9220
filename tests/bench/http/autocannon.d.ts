// The part of autocannon 9's programmatic API the HTTP bench uses (the package ships no types).
declare module 'autocannon' {
  export type AutocannonRequest = {
    method?: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';
    path: string;
    headers?: Record<string, string>;
    body?: string;
    /** Called before each send of this request; returns the request to send. */
    setupRequest?: (request: AutocannonRequest, context: Record<string, unknown>) => AutocannonRequest;
    /** Called with each response to this request, just before the instance's 'response' event. */
    onResponse?: (status: number, body: string, context: Record<string, unknown>) => void;
  };

  export type AutocannonClient = { setRequests: (requests: AutocannonRequest[]) => void };

  export type AutocannonOptions = {
    url: string;
    connections: number;
    duration: number;
    timeout?: number;
    /** Requests per second from each connection; without it each sends the next as soon as an answer arrives. */
    connectionRate?: number;
    requests: AutocannonRequest[];
    setupClient?: (client: AutocannonClient) => void;
  };

  export type Histogram = { average: number; mean: number; stddev: number; min: number; max: number; p50: number; p90: number; p99: number; p97_5: number };

  export type AutocannonResult = {
    duration: number;
    errors: number;
    timeouts: number;
    non2xx: number;
    resets: number;
    statusCodeStats: Record<string, { count: number }>;
    latency: Histogram & { totalCount: number };
    requests: Histogram & { total: number; sent: number };
    /** Bytes read from the sockets, headers included. */
    throughput: Histogram & { total: number };
  };

  export type AutocannonInstance = PromiseLike<AutocannonResult> & {
    on(event: 'response', listener: (client: AutocannonClient, statusCode: number, bytes: number, responseTimeMs: number) => void): void;
    stop(): void;
  };

  function autocannon(options: AutocannonOptions): AutocannonInstance;
  export default autocannon;
}
