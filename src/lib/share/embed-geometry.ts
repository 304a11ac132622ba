/**
 * Geometry of the embed page, shared by the page (CSS), the oEmbed endpoint (iframe height) and the share dialog.
 *
 * The server draws the notation at a few widths ("buckets") and the page shows the one that suits the frame
 * (a CSS media query per bucket), so bars re-wrap into more systems on a phone instead of shrinking to an
 * unreadable size. Within a bucket the drawing scales with the frame (at most ×1.33 up, never below its width
 * × 480/540 down). Header and controls have fixed heights, so the height of an embed at a given width is known
 * on the server and an oEmbed answer can give the exact iframe size.
 */

/** Widths (CSS pixels) the notation is drawn at. */
export const WIDTH_BUCKETS = [360, 540, 720, 960, 1280] as const;
export type WidthBucket = (typeof WIDTH_BUCKETS)[number];

/** Smallest content width at which each bucket is used (same order as WIDTH_BUCKETS). */
export const BUCKET_FROM = [0, 480, 660, 880, 1160] as const;

/** Fixed parts of the embed page, CSS pixels. */
export const EMBED_CHROME = {
  /** Padding around the page. */
  padding: 12,
  /** Title row. */
  header: 40,
  /** Play controls row. */
  controls: 40,
  /** Gap between rows. */
  gap: 8,
} as const;

/** Vertical room taken by everything but the notation. */
export const CHROME_HEIGHT = 2 * EMBED_CHROME.padding + EMBED_CHROME.header + EMBED_CHROME.controls + 2 * EMBED_CHROME.gap;

/** Default and limits of an embed's width, CSS pixels. */
export const EMBED_WIDTH = { default: 720, min: 280, max: 1600 } as const;

/**
 * The bucket used for a content width (frame width minus padding).
 * @example bucketForContentWidth(600) // 540
 */
export function bucketForContentWidth(contentWidth: number): WidthBucket {
  let chosen: WidthBucket = WIDTH_BUCKETS[0];
  WIDTH_BUCKETS.forEach((b, i) => {
    if (contentWidth >= BUCKET_FROM[i]!) chosen = b;
  });
  return chosen;
}

/** Content width of a frame `frameWidth` pixels wide. */
export function contentWidthOf(frameWidth: number): number {
  return Math.max(1, frameWidth - 2 * EMBED_CHROME.padding);
}

/**
 * Height of the embed page in a frame of `frameWidth` pixels, given the drawn size of each bucket.
 * @example embedHeight(720, { 540: { width: 540, height: 404 } }) // 120 + 404 × 696/540 → 641
 */
export function embedHeight(frameWidth: number, drawn: Partial<Record<WidthBucket, { width: number; height: number }>>): number {
  const content = contentWidthOf(frameWidth);
  const bucket = bucketForContentWidth(content);
  const size = drawn[bucket];
  const notation = size ? (size.height * content) / size.width : 0;
  return Math.ceil(CHROME_HEIGHT + notation);
}

/**
 * CSS that shows exactly one bucket's drawing for the width of the figure that holds it (a container query on
 * `.tx-notation`, so the same drawings work full width in an embed and half width side by side), and the 720
 * drawing in print.
 * @example bucketCss() // ".tx-notation{container-type:inline-size}.tx-bucket{display:none}@container (max-width:479.98px){…}…"
 */
export function bucketCss(): string {
  let css = ".tx-notation{container-type:inline-size}.tx-bucket{display:none}";
  WIDTH_BUCKETS.forEach((b, i) => {
    const from = BUCKET_FROM[i]!;
    const next = BUCKET_FROM[i + 1];
    const conds = [i > 0 ? `(min-width:${from}px)` : "", next !== undefined ? `(max-width:${next - 0.02}px)` : ""].filter(Boolean).join(" and ");
    css += `@container ${conds}{.tx-bucket[data-w='${b}']{display:block}}`;
  });
  css += "@media print{.tx-notation{container-type:normal}.tx-bucket{display:none!important}.tx-bucket[data-w='720']{display:block!important}}";
  return css;
}
