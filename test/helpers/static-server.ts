import { readFile } from "node:fs/promises";
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import { extname, join, normalize } from "node:path";

const TYPES: Record<string, string> = {
  ".html": "text/html; charset=utf-8",
  ".js": "text/javascript; charset=utf-8",
  ".css": "text/css; charset=utf-8",
  ".json": "application/json",
  ".svg": "image/svg+xml",
};

/** A plain static file server on 127.0.0.1 (any free port), as a user would serve dist/web. */
export interface StaticServer {
  /** `http://127.0.0.1:PORT` */
  readonly origin: string;
  close(): Promise<void>;
}

/** Serves the files under `root` (GET only, index.html for folders, 404 otherwise). */
export async function serveFolder(root: string): Promise<StaticServer> {
  const server: Server = createServer((request, response) => {
    const path = decodeURIComponent(new URL(request.url ?? "/", "http://localhost").pathname);
    const file = join(root, normalize(path.endsWith("/") ? `${path}index.html` : path).replace(/^(\.\.[/\\])+/, ""));
    readFile(file).then(
      (body) => {
        response.writeHead(200, { "content-type": TYPES[extname(file)] ?? "application/octet-stream" });
        response.end(body);
      },
      () => {
        response.writeHead(404, { "content-type": "text/plain" });
        response.end("not found");
      },
    );
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const { port } = server.address() as AddressInfo;
  return {
    origin: `http://127.0.0.1:${port}`,
    close: () => new Promise<void>((resolve, reject) => server.close((error) => (error ? reject(error) : resolve()))),
  };
}
