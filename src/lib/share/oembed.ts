/**
 * oEmbed 1.0 (oembed.com), the pure parts: which Tactus address a consumer asks about, and the sizes to answer
 * with. The spec: a "rich" response has `html`, `width` and `height`, and when the consumer sends maxwidth or
 * maxheight, the embed (and any thumbnail) must fit inside them.
 */
import { DEFAULT_EMBED_OPTIONS, parseEmbedOptions, PREVIEW_IMAGE, previewImageHeight, type EmbedOptions, type EmbedTarget } from "./embed-options";
import { EMBED_WIDTH } from "./embed-geometry";

export interface SharedAddress {
  /** What to embed: a version (immutable) or a groove's latest version. */
  target: EmbedTarget;
  /** The groove the address names, when it names one (a version address alone does not). */
  grooveId?: string;
  options: EmbedOptions;
}

const ID = "([A-Za-z0-9_-]{1,64})";
const GROOVE_PAGE = new RegExp(`^/grooves/${ID}/?$`);
const VERSION_EMBED = new RegExp(`^/embed/v/${ID}/?$`);
const GROOVE_EMBED = new RegExp(`^/embed/g/${ID}/?$`);

/**
 * Which groove or version a URL names, if it is a Tactus address on one of `hosts` (groove page, with or without
 * ?version=, or an embed address with its options); null for anything else.
 * @example parseSharedUrl("http://h/grooves/abc?version=v1", ["h"]) // { target: { versionId: "v1" }, grooveId: "abc", options: … }
 */
export function parseSharedUrl(raw: string, hosts: readonly string[]): SharedAddress | null {
  let url: URL;
  try {
    url = new URL(raw);
  } catch {
    return null;
  }
  if ((url.protocol !== "http:" && url.protocol !== "https:") || !hosts.includes(url.host)) return null;
  const path = url.pathname;
  let m = GROOVE_PAGE.exec(path);
  if (m) {
    const version = url.searchParams.get("version");
    if (version !== null && !/^[A-Za-z0-9_-]{1,64}$/.test(version)) return null;
    return { target: version ? { versionId: version } : { grooveId: m[1]! }, grooveId: m[1]!, options: DEFAULT_EMBED_OPTIONS };
  }
  m = VERSION_EMBED.exec(path);
  if (m) return { target: { versionId: m[1]! }, options: parseEmbedOptions(url.searchParams) };
  m = GROOVE_EMBED.exec(path);
  if (m) return { target: { grooveId: m[1]! }, grooveId: m[1]!, options: parseEmbedOptions(url.searchParams) };
  return null;
}

/**
 * The iframe width for a request: the default, narrowed to maxwidth (never wider than asked).
 * @example frameWidth(500) // 500
 */
export function frameWidth(maxwidth?: number): number {
  return maxwidth !== undefined ? Math.min(EMBED_WIDTH.default, Math.floor(maxwidth)) : EMBED_WIDTH.default;
}

/**
 * The thumbnail to offer: the widest preview image that fits both limits, or null when none does.
 * @example thumbnailFor(400, undefined) // { width: 300, height: 158 }
 */
export function thumbnailFor(maxwidth?: number, maxheight?: number): { width: number; height: number } | null {
  for (const width of PREVIEW_IMAGE.widths) {
    const height = previewImageHeight(width);
    if ((maxwidth === undefined || width <= maxwidth) && (maxheight === undefined || height <= maxheight)) return { width, height };
  }
  return null;
}
