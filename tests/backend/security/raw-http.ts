import { request } from "node:http";

/**
 * One HTTP request with the path sent byte for byte as given: fetch() would normalise dot
 * segments and encoded characters before they reach the server, which is what these tests probe.
 */
export function rawRequest(
  baseUrl: string,
  method: string,
  path: string,
  opts: { headers?: Record<string, string>; body?: string } = {},
): Promise<{ status: number; body: string; headers: Record<string, string | string[] | undefined> }> {
  const u = new URL(baseUrl);
  return new Promise((resolve, reject) => {
    const req = request(
      {
        host: u.hostname,
        port: u.port,
        method,
        path,
        headers: { ...(opts.body !== undefined ? { "content-length": Buffer.byteLength(opts.body).toString() } : {}), ...opts.headers },
      },
      (res) => {
        const chunks: Buffer[] = [];
        res.on("data", (c: Buffer) => chunks.push(c));
        res.on("end", () => resolve({ status: res.statusCode ?? 0, body: Buffer.concat(chunks).toString("utf8"), headers: res.headers }));
        res.on("error", reject);
      },
    );
    req.on("error", reject);
    if (opts.body !== undefined) req.write(opts.body);
    req.end();
  });
}
