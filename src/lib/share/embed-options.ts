/**
 * Addresses of Tactus's public surfaces (embed pages, preview images, oEmbed) and the options an embed takes,
 * in one place so the pages, the oEmbed endpoint, the share dialog and the response cache agree on them.
 * Pure and tiny (the share dialog ships it to the browser).
 *
 * Embed options (query string of /embed/v/ID and /embed/g/ID):
 *   keys=0        hide the keys part (the kit staff alone); default: shown
 *   bar=N         start playing at written bar N (1-based); default 1
 *   theme=light|dark  force a theme; default: follow the viewer's system setting
 * Autoplay does not exist: an embed never makes a sound before the viewer presses play.
 */

export type EmbedTheme = "auto" | "light" | "dark";

export interface EmbedOptions {
  /** Show the keys part (grand staff) under the kit staff. */
  readonly keys: boolean;
  /** Written bar to start playing from, 1-based. */
  readonly startBar: number;
  readonly theme: EmbedTheme;
}

export const DEFAULT_EMBED_OPTIONS: EmbedOptions = { keys: true, startBar: 1, theme: "auto" };

/** Highest start bar accepted in an address (documents have at most 4,096 bars). */
const MAX_BAR = 4096;

/**
 * Read embed options from a query string. Unknown keys and malformed values fall back to the defaults, so any
 * address renders (and the response cache keys only on what changes the page).
 * @example parseEmbedOptions(new URLSearchParams("keys=0&bar=3")) // { keys: false, startBar: 3, theme: "auto" }
 */
export function parseEmbedOptions(params: URLSearchParams): EmbedOptions {
  const keys = params.get("keys");
  const bar = params.get("bar");
  const theme = params.get("theme");
  const startBar = bar !== null && /^\d{1,4}$/.test(bar) ? Math.min(MAX_BAR, Math.max(1, Number(bar))) : 1;
  return {
    keys: !(keys === "0" || keys === "false" || keys === "no"),
    startBar,
    theme: theme === "light" || theme === "dark" ? theme : "auto",
  };
}

/**
 * The canonical query string of options (only what differs from the defaults, in a fixed order), "" for none.
 * @example embedQuery({ keys: false, startBar: 1, theme: "auto" }) // "?keys=0"
 */
export function embedQuery(o: EmbedOptions): string {
  const parts: string[] = [];
  if (!o.keys) parts.push("keys=0");
  if (o.startBar > 1) parts.push(`bar=${o.startBar}`);
  if (o.theme !== "auto") parts.push(`theme=${o.theme}`);
  return parts.length ? `?${parts.join("&")}` : "";
}

/** What an embed shows: one saved version (immutable) or a groove's latest shared version. */
export type EmbedTarget = { readonly versionId: string } | { readonly grooveId: string };

/**
 * Path of an embed page.
 * @example embedPath({ versionId: "LmpHarbour1v1" }, DEFAULT_EMBED_OPTIONS) // "/embed/v/LmpHarbour1v1"
 */
export function embedPath(target: EmbedTarget, o: EmbedOptions = DEFAULT_EMBED_OPTIONS): string {
  const base = "versionId" in target ? `/embed/v/${encodeURIComponent(target.versionId)}` : `/embed/g/${encodeURIComponent(target.grooveId)}`;
  return base + embedQuery(o);
}

/**
 * Path of the compare embed of two readings (version or groove ids).
 * @example compareEmbedPath("LmpUndertA1", "LmpUndertB1") // "/embed/compare?a=LmpUndertA1&b=LmpUndertB1"
 */
export function compareEmbedPath(a: string, b: string): string {
  return `/embed/compare?a=${encodeURIComponent(a)}&b=${encodeURIComponent(b)}`;
}

/** Path of the preview image (Open Graph / Twitter card / oEmbed thumbnail) of a version, at a width bucket. */
export function previewImagePath(versionId: string, width: number = PREVIEW_IMAGE.width): string {
  return `/og/${encodeURIComponent(versionId)}.png${width === PREVIEW_IMAGE.width ? "" : `?w=${width}`}`;
}

/** The preview image: the usual link-card size (1.91 : 1), and the smaller widths it is also drawn at. */
export const PREVIEW_IMAGE = { width: 1200, height: 630, widths: [1200, 600, 300, 150] as readonly number[] } as const;

/** Height of a preview image drawn `width` pixels wide (same aspect ratio). */
export function previewImageHeight(width: number): number {
  return Math.round((width * PREVIEW_IMAGE.height) / PREVIEW_IMAGE.width);
}

const escapeAttr = (s: string) => s.replace(/&/g, "&amp;").replace(/"/g, "&quot;").replace(/</g, "&lt;").replace(/>/g, "&gt;");

/**
 * The iframe snippet for an embed: fixed width and height attributes (oEmbed consumers need them) and a style
 * that lets the frame shrink on narrow pages. No autoplay permission is ever asked for.
 * @example iframeSnippet("https://tactus.example/embed/v/abc", { width: 720, height: 380, title: "Salt Road" })
 */
export function iframeSnippet(src: string, { width, height, title }: { width: number; height: number; title: string }): string {
  return (
    `<iframe src="${escapeAttr(src)}" width="${width}" height="${height}" title="${escapeAttr(`${title} (Tactus)`)}" ` +
    `style="border:0;max-width:100%" loading="lazy"></iframe>`
  );
}

/**
 * The oEmbed discovery address for a page (JSON format).
 * @example oembedHref("https://t.example", "https://t.example/grooves/abc") // "https://t.example/api/oembed?url=https%3A%2F%2Ft.example%2Fgrooves%2Fabc&format=json"
 */
export function oembedHref(origin: string, pageUrl: string): string {
  return `${origin}/api/oembed?url=${encodeURIComponent(pageUrl)}&format=json`;
}

/** Address of a groove page, or of one version of it. */
export function groovePagePath(grooveId: string, versionId?: string): string {
  return `/grooves/${encodeURIComponent(grooveId)}${versionId ? `?version=${encodeURIComponent(versionId)}` : ""}`;
}

/**
 * The key the response cache stores an embed page under: host, path and the options that change the page
 * (compare pages: the two readings too), in canonical form. Anything else in the query is ignored by the pages.
 * `host` is the Host header the client sent (absolute links in the page depend on it).
 * @example embedCacheKey(new URL("http://h/embed/v/x?bar=2&utm=1")) // "h/embed/v/x?bar=2"
 */
export function embedCacheKey(url: URL, host: string = url.host): string {
  const path = url.pathname.replace(/\/+$/, "");
  let query = embedQuery(parseEmbedOptions(url.searchParams));
  if (path === "/embed/compare") {
    const pair = `a=${encodeURIComponent(url.searchParams.get("a") ?? "")}&b=${encodeURIComponent(url.searchParams.get("b") ?? "")}`;
    query = query ? `?${pair}&${query.slice(1)}` : `?${pair}`;
  }
  return `${host}${path}${query}`;
}
