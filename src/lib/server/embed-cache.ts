// Caches behind the embed pages, so repeated views cost no rendering:
//
// 1. Notation drawings per version, width bucket and keys option (versions never change, so entries never go
//    stale; a size-bounded LRU keeps memory in check).
// 2. Whole responses of the embed pages (body, gzip body, headers, strong ETag), served by the middleware
//    without running the page. Each stored page names the grooves it shows with their `updated_at` (and, for
//    "latest" pages, the version shown); before answering from the store each groove's state is checked
//    (grooveState in sharing.ts: read at most once a second, and again after any write request), so a groove made
//    private, deleted or saved again through Tactus is never served stale.
import { createHash } from "node:crypto";
import { gzipSync } from "node:zlib";
import { renderScoreOnServer, type RenderResult, type ScoreLayout } from "../../adapters/vexflow/server";
import type { GrooveDocument } from "../rhythm/document";
import { spellGroove, type NotationScore } from "../rhythm/notation";
import { WIDTH_BUCKETS, type WidthBucket } from "../share/embed-geometry";
import { grooveState } from "./sharing";

/** A small least-recently-used map bounded by entry count and by total weight (bytes). */
export class Lru<V> {
  private readonly map = new Map<string, { value: V; weight: number }>();
  private total = 0;
  constructor(
    private readonly maxEntries: number,
    private readonly maxWeight = Infinity,
  ) {}
  /** Whether `key` is present, without touching its recency. */
  peek(key: string): boolean {
    return this.map.has(key);
  }
  get(key: string): V | undefined {
    const e = this.map.get(key);
    if (!e) return undefined;
    this.map.delete(key);
    this.map.set(key, e);
    return e.value;
  }
  set(key: string, value: V, weight = 1): void {
    this.delete(key);
    this.map.set(key, { value, weight });
    this.total += weight;
    while (this.map.size > this.maxEntries || (this.total > this.maxWeight && this.map.size > 1)) {
      const oldest = this.map.keys().next().value!;
      this.delete(oldest);
    }
  }
  delete(key: string): void {
    const e = this.map.get(key);
    if (!e) return;
    this.total -= e.weight;
    this.map.delete(key);
  }
  get size(): number {
    return this.map.size;
  }
  clear(): void {
    this.map.clear();
    this.total = 0;
  }
}

// ---------------------------------------------------------------------------------------------------------------
// Notation drawings

export interface Drawing {
  /** Inline SVG (VexFlow ids removed: several drawings share one page). */
  svg: string;
  layout: ScoreLayout;
}

const scores = new Lru<NotationScore>(500);
const drawings = new Lru<Drawing>(3000, 96 * 1024 * 1024);
let renderCount = 0;

/** Drawings made since the process started (tests and benchmarks check that cached views draw nothing). */
export function renderCounter(): number {
  return renderCount;
}

/** The spelled score of a version (cached). */
export function scoreOf(versionId: string, doc: GrooveDocument): NotationScore {
  let s = scores.get(versionId);
  if (!s) {
    s = spellGroove(doc);
    scores.set(versionId, s);
  }
  return s;
}

/**
 * Strip what a page holding several drawings must not repeat (VexFlow's element ids) and what costs bytes without
 * changing a pixel: VexFlow's class names, and fill/stroke="currentColor" below the root, which already says it
 * (inherited, unless some group in between sets "none": then those attributes stay).
 * @example tidyForPage('<svg fill="currentColor"><g class="vf-stave" fill="currentColor"><path/></g></svg>') // '<svg fill="currentColor"><g><path/></g></svg>'
 */
export function tidyForPage(svg: string): string {
  let out = svg.replace(/ id="vf-[^"]*"/g, "").replace(/ class="vf-[^"]*"/g, "");
  const rootEnd = out.indexOf(">") + 1;
  const root = out.slice(0, rootEnd);
  const inheritsColour = /\bfill="currentColor"/.test(root) && /\bstroke="currentColor"/.test(root);
  if (inheritsColour && !/<g\b[^>]*\b(?:fill|stroke)="none"/.test(out)) {
    out = root + out.slice(rootEnd).replace(/ (?:fill|stroke)="currentColor"/g, "");
  }
  return out;
}

export interface DrawOptions {
  width: number;
  keys: boolean;
  fromBar?: number;
  toBar?: number;
  theme?: { color?: string; background?: string };
}

/**
 * The drawing of a version at a width (cached per version and options).
 * @example const { svg, layout } = drawVersion(v.id, v.document, { width: 720, keys: true })
 */
export function drawVersion(versionId: string, doc: GrooveDocument, o: DrawOptions): Drawing {
  const key = `${versionId}|${o.width}|${o.keys ? 1 : 0}|${o.fromBar ?? ""}|${o.toBar ?? ""}|${o.theme?.color ?? ""}|${o.theme?.background ?? ""}`;
  const hit = drawings.get(key);
  if (hit) return hit;
  const score = scoreOf(versionId, doc);
  const r: RenderResult = renderScoreOnServer(score, {
    width: o.width,
    showKeys: o.keys,
    ...(o.fromBar !== undefined ? { fromBar: o.fromBar } : {}),
    ...(o.toBar !== undefined ? { toBar: o.toBar } : {}),
    ...(o.theme ? { theme: o.theme } : {}),
  });
  renderCount++;
  const drawing = { svg: tidyForPage(r.svg), layout: r.layout };
  drawings.set(key, drawing, drawing.svg.length * 2 + 4096);
  return drawing;
}

/** The drawing of a version at every width bucket. */
export function drawBuckets(versionId: string, doc: GrooveDocument, keys: boolean): Map<WidthBucket, Drawing> {
  return new Map(WIDTH_BUCKETS.map((w) => [w, drawVersion(versionId, doc, { width: w, keys })]));
}

// ---------------------------------------------------------------------------------------------------------------
// Whole responses

/** A groove a stored page shows, and what it looked like when the page was made. */
export interface PageDependency {
  grooveId: string;
  /** grooves.updated_at in milliseconds. */
  updatedAt: number;
  /** For pages that show the latest version: the version shown (a newer save makes the page stale). */
  latestVersionId?: string;
}

export interface StoredPage {
  status: number;
  headers: [string, string][];
  body: Uint8Array;
  gzip: Uint8Array | null;
  /** Strong validator of the identity body; the gzip body's is the same with "-gz". */
  etag: string;
  deps: PageDependency[];
}

/** Response header by which a page asks to be stored; removed before the response leaves the server. */
export const STORE_HEADER = "x-tactus-store";

/**
 * The header value a page sets to be stored: its dependencies as JSON.
 * @example Astro.response.headers.set(STORE_HEADER, storeDirective([{ grooveId, updatedAt }]))
 */
export function storeDirective(deps: PageDependency[]): string {
  return JSON.stringify(deps);
}

export function readStoreDirective(value: string | null): PageDependency[] | null {
  if (!value) return null;
  try {
    const deps = JSON.parse(value) as PageDependency[];
    return Array.isArray(deps) && deps.every((d) => typeof d.grooveId === "string" && typeof d.updatedAt === "number") ? deps : null;
  } catch {
    return null;
  }
}

const pages = new Lru<StoredPage>(2000, 128 * 1024 * 1024);

/**
 * A strong ETag of some bytes: SHA-256, base64url, quoted.
 * @example strongEtag(new TextEncoder().encode("x")) // "\"LXPs…\""
 */
export function strongEtag(bytes: Uint8Array): string {
  return `"${createHash("sha256").update(bytes).digest("base64url").slice(0, 32)}"`;
}

/** Whether an If-None-Match header matches one of the given ETags (weak comparison, RFC 9110 §13.1.2). */
export function matchesEtag(ifNoneMatch: string | null, ...etags: string[]): boolean {
  if (!ifNoneMatch) return false;
  if (ifNoneMatch.trim() === "*") return true;
  const wanted = ifNoneMatch.split(",").map((t) => t.trim().replace(/^W\//, ""));
  return etags.some((e) => wanted.includes(e));
}

/** Store a page's response under `key` (compressing it once). */
export function storePage(key: string, page: Omit<StoredPage, "gzip" | "etag">): StoredPage {
  const gzip = page.body.byteLength > 1024 ? new Uint8Array(gzipSync(page.body, { level: 6 })) : null;
  const stored: StoredPage = { ...page, gzip, etag: strongEtag(page.body) };
  pages.set(key, stored, page.body.byteLength + (gzip?.byteLength ?? 0) + 1024);
  return stored;
}

/**
 * The stored page for `key` when every groove it shows is still shared and unchanged; otherwise it is dropped
 * and null is returned (the page is then rendered again).
 */
export async function freshPage(key: string): Promise<StoredPage | null> {
  const page = pages.get(key);
  if (!page) return null;
  const states = await Promise.all(page.deps.map((d) => grooveState(d.grooveId)));
  const fresh = page.deps.every((d, i) => {
    const s = states[i];
    return s !== null && s !== undefined && s.shared && s.updatedAt === d.updatedAt && (d.latestVersionId === undefined || d.latestVersionId === s.latestVersionId);
  });
  if (fresh) return page;
  pages.delete(key);
  return null;
}

/** Empties both caches (tests). */
export function clearEmbedCaches(): void {
  pages.clear();
  drawings.clear();
  scores.clear();
}

// ---------------------------------------------------------------------------------------------------------------
// Answers

const gzEtag = (etag: string) => `${etag.slice(0, -1)}-gz"`;

function acceptsGzip(acceptEncoding: string | null | undefined): boolean {
  return /(^|,)\s*(gzip|\*)\s*(;\s*q=(?!0(\.0*)?\s*(,|$))[\d.]+)?\s*(,|$)/i.test(acceptEncoding ?? "");
}

export interface StoredAnswer {
  status: number;
  headers: Record<string, string>;
  /** null for 304 and HEAD. */
  body: Uint8Array | null;
}

/**
 * What to answer from a stored page: 304 when If-None-Match names it, else the body (gzip when the client
 * accepts it); HEAD gets the headers alone.
 * @example storedAnswer(page, { method: "GET", acceptEncoding: "gzip", ifNoneMatch: null }).headers["content-encoding"] // "gzip"
 */
export function storedAnswer(page: StoredPage, req: { method: string; acceptEncoding?: string | null; ifNoneMatch?: string | null }): StoredAnswer {
  const gzip = page.gzip !== null && acceptsGzip(req.acceptEncoding);
  const etag = gzip ? gzEtag(page.etag) : page.etag;
  const headers: Record<string, string> = {};
  for (const [k, v] of page.headers) headers[k] = v;
  headers.etag = etag;
  if (page.gzip) headers.vary = "Accept-Encoding";
  if (matchesEtag(req.ifNoneMatch ?? null, page.etag, gzEtag(page.etag))) {
    const kept: Record<string, string> = {};
    for (const name of ["cache-control", "etag", "vary", "x-robots-tag", "content-security-policy"]) if (headers[name]) kept[name] = headers[name]!;
    return { status: 304, headers: kept, body: null };
  }
  const body = gzip ? page.gzip! : page.body;
  if (gzip) headers["content-encoding"] = "gzip";
  headers["content-length"] = String(body.byteLength);
  return { status: page.status, headers, body: req.method === "HEAD" ? null : body };
}

/** The web Response for a stored page (see storedAnswer). */
export function answerStored(request: Request, page: StoredPage): Response {
  const a = storedAnswer(page, {
    method: request.method,
    acceptEncoding: request.headers.get("accept-encoding"),
    ifNoneMatch: request.headers.get("if-none-match"),
  });
  return new Response(a.body as Uint8Array<ArrayBuffer> | null, { status: a.status, headers: a.headers });
}

/** Whether a page is stored under `key` (fresh or not: freshPage decides). */
export function hasStoredPage(key: string): boolean {
  return pages.peek(key);
}

/** 304 for any GET response that carries an ETag the client already has (preview images, sitemap). */
export function conditional(request: Request, response: Response): Response {
  const etag = response.headers.get("etag");
  if (response.status !== 200 || !etag || !matchesEtag(request.headers.get("if-none-match"), etag)) return response;
  void response.body?.cancel().catch(() => {});
  const headers = new Headers();
  for (const name of ["cache-control", "etag", "vary", "x-robots-tag"]) {
    const v = response.headers.get(name);
    if (v) headers.set(name, v);
  }
  return new Response(null, { status: 304, headers });
}
