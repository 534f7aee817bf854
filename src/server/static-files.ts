import { readFile, stat } from 'node:fs/promises';
import { extname, resolve, sep } from 'node:path';
import type { FastifyReply, FastifyRequest } from 'fastify';
import { HttpError } from './http-error';

const CONTENT_TYPES: Readonly<Record<string, string>> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.map': 'application/json; charset=utf-8',
  '.webmanifest': 'application/manifest+json; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.ico': 'image/x-icon',
  '.webp': 'image/webp',
  '.woff2': 'font/woff2',
  '.txt': 'text/plain; charset=utf-8',
};

// Vite's content-hashed output, e.g. assets/index-B3xq9Zk1.js: safe to cache for a year.
const HASHED_ASSET = /^\/assets\/.+-[A-Za-z0-9_-]{8,}\.[a-z0-9]+$/;

/** Cache policy: hashed assets are immutable; everything else (index.html, sw.js, manifest, icons) is revalidated. */
export function cacheControlFor(urlPath: string): string {
  return HASHED_ASSET.test(urlPath) ? 'public, max-age=31536000, immutable' : 'no-cache';
}

/**
 * Serves a GET/HEAD for the built app from `distDir`. A path with no file behind it and no
 * file extension is an app route: it gets index.html (the SPA fallback). A missing file with an
 * extension is a 404, so a stale script URL never receives HTML.
 */
export async function serveStatic(distDir: string, request: FastifyRequest, reply: FastifyReply): Promise<void> {
  const root = resolve(distDir);
  const urlPath = decodePath(request.url);
  const candidate = resolve(root, `.${urlPath}`);
  if (candidate !== root && !candidate.startsWith(root + sep)) throw new HttpError(404, 'not-found', 'There is no such file.');

  const file = (await isFile(candidate)) ? candidate : undefined;
  if (file) return sendFile(file, urlPath, request, reply);
  if (extname(urlPath) !== '') throw new HttpError(404, 'not-found', `There is no file at ${urlPath}.`);
  const index = resolve(root, 'index.html');
  if (!(await isFile(index))) throw new HttpError(404, 'not-built', 'The app has not been built on this server; run "npm run build" first.');
  return sendFile(index, '/index.html', request, reply);
}

async function sendFile(path: string, urlPath: string, request: FastifyRequest, reply: FastifyReply): Promise<void> {
  const info = await stat(path);
  const etag = `W/"${info.size.toString(16)}-${Math.floor(info.mtimeMs).toString(16)}"`;
  reply
    .header('content-type', CONTENT_TYPES[extname(path).toLowerCase()] ?? 'application/octet-stream')
    .header('cache-control', cacheControlFor(urlPath))
    .header('etag', etag)
    .header('last-modified', info.mtime.toUTCString());
  if (request.headers['if-none-match'] === etag) {
    await reply.code(304).send();
    return;
  }
  await reply.code(200).send(await readFile(path));
}

function decodePath(url: string): string {
  const path = url.split('?')[0] ?? '/';
  let decoded: string;
  try {
    decoded = decodeURIComponent(path);
  } catch {
    throw new HttpError(400, 'bad-request', 'The address is not properly encoded.');
  }
  if (decoded.includes('\0')) throw new HttpError(400, 'bad-request', 'The address is not valid.');
  return decoded;
}

async function isFile(path: string): Promise<boolean> {
  try {
    return (await stat(path)).isFile();
  } catch {
    return false; // missing or unreadable: treated as absent
  }
}
