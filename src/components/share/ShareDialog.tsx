/**
 * The share dialog of a groove page: the plain link, and an iframe snippet for the embed with a chosen width and
 * options (show the keys part or not, the start bar; an embed never plays by itself), each with a copy button that
 * confirms. The snippet's height comes from the oEmbed endpoint, so it is exactly what the embed needs at that
 * width. Private grooves cannot be embedded: the dialog says so and offers nothing to copy.
 */
import { useEffect, useId, useRef, useState } from "react";
import { EMBED_WIDTH } from "../../lib/share/embed-geometry";
import { embedPath, groovePagePath, iframeSnippet, type EmbedOptions } from "../../lib/share/embed-options";

export interface ShareDialogProps {
  grooveId: string;
  title: string;
  visibility: "private" | "link" | "public";
  /** The version shown on the page, and whether it is the latest. */
  versionId: string;
  versionNumber: number;
  isLatest: boolean;
  bars: number;
  hasKeys: boolean;
  /** Whether the viewer may change the visibility (owner): the private notice then says how. */
  canShare: boolean;
}

type Copied = "link" | "snippet" | null;

async function copyText(text: string, fallback: HTMLTextAreaElement | HTMLInputElement | null): Promise<boolean> {
  try {
    await navigator.clipboard.writeText(text);
    return true;
  } catch {
    // No clipboard permission (an insecure origin, an old browser): select the text and use the legacy command.
    if (!fallback) return false;
    fallback.focus();
    fallback.select();
    try {
      return document.execCommand("copy");
    } catch {
      return false;
    }
  }
}

export default function ShareDialog(props: ShareDialogProps) {
  const dialog = useRef<HTMLDialogElement>(null);
  const linkField = useRef<HTMLInputElement>(null);
  const snippetField = useRef<HTMLTextAreaElement>(null);
  const ids = useId();
  const [origin, setOrigin] = useState("");
  const [which, setWhich] = useState<"latest" | "version">(props.isLatest ? "latest" : "version");
  const [width, setWidth] = useState<number>(EMBED_WIDTH.default);
  const [keys, setKeys] = useState(true);
  const [startBar, setStartBar] = useState(1);
  const [height, setHeight] = useState<number | null>(null);
  const [copied, setCopied] = useState<Copied>(null);
  const [problem, setProblem] = useState<string | null>(null);

  useEffect(() => setOrigin(window.location.origin), []);

  const shareable = props.visibility !== "private";
  const options: EmbedOptions = { keys: props.hasKeys ? keys : true, startBar: Math.min(Math.max(1, startBar), props.bars), theme: "auto" };
  const target = which === "latest" ? { grooveId: props.grooveId } : { versionId: props.versionId };
  const embedUrl = origin + embedPath(target, options);
  const pageUrl = origin + groovePagePath(props.grooveId, which === "latest" ? undefined : props.versionId);
  const cleanWidth = Math.min(EMBED_WIDTH.max, Math.max(EMBED_WIDTH.min, Math.round(width) || EMBED_WIDTH.default));
  const snippet = height !== null ? iframeSnippet(embedUrl, { width: cleanWidth, height, title: props.title }) : "";

  // Ask the oEmbed endpoint for the height at this width (debounced while typing).
  useEffect(() => {
    if (!shareable || !origin) return;
    const controller = new AbortController();
    const timer = setTimeout(() => {
      fetch(`/api/oembed?format=json&maxwidth=${cleanWidth}&url=${encodeURIComponent(embedUrl)}`, { signal: controller.signal, headers: { accept: "application/json" } })
        .then(async (r) => {
          const body = (await r.json()) as { height?: number; error?: { message: string } };
          if (!r.ok || typeof body.height !== "number") throw new Error(body.error?.message ?? `The server answered ${r.status}.`);
          setHeight(body.height);
          setProblem(null);
        })
        .catch((e: unknown) => {
          if (controller.signal.aborted) return;
          setProblem(e instanceof Error ? e.message : String(e));
        });
    }, 200);
    return () => {
      clearTimeout(timer);
      controller.abort();
    };
  }, [shareable, origin, embedUrl, cleanWidth]);

  useEffect(() => {
    if (!copied) return;
    const t = setTimeout(() => setCopied(null), 2500);
    return () => clearTimeout(t);
  }, [copied]);

  const copy = async (what: Exclude<Copied, null>) => {
    const ok = await copyText(what === "link" ? pageUrl : snippet, what === "link" ? linkField.current : snippetField.current);
    if (ok) setCopied(what);
    else setProblem("Could not copy: select the text and copy it by hand.");
  };

  const field = "rounded-md border border-line-strong bg-surface-raised px-3 py-2 text-sm text-ink";
  const button = "rounded-md border border-line-strong px-3 py-1.5 text-sm font-medium text-ink hover:border-brass";

  return (
    <>
      <button type="button" className={button} onClick={() => dialog.current?.showModal()} data-testid="share-open">
        Share…
      </button>
      <dialog
        ref={dialog}
        aria-labelledby={`${ids}-title`}
        className="m-auto w-[min(44rem,calc(100vw-2rem))] rounded-xl border border-line bg-surface p-0 text-ink shadow-xl backdrop:bg-black/40"
        data-testid="share-dialog"
      >
        <div className="flex flex-col gap-5 p-5">
          <div className="flex items-start justify-between gap-4">
            <h2 id={`${ids}-title`} className="text-lg font-semibold">
              Share “{props.title}”
            </h2>
            <button type="button" className={button} onClick={() => dialog.current?.close()}>
              Close
            </button>
          </div>

          {!shareable ? (
            <p className="rounded-md border-l-4 border-brass bg-surface-sunken px-3 py-2" data-testid="share-private">
              This groove is private: only its owner and the people invited to it can open it, and it cannot be embedded.{" "}
              {props.canShare ? "To share it, set “Who can see it” to “Anyone with the link” or “Public” below." : "Ask its owner to share it."}
            </p>
          ) : (
            <>
              <fieldset className="flex flex-wrap gap-x-5 gap-y-2 text-sm">
                <legend className="mb-1 font-medium">What to share</legend>
                <label className="flex items-center gap-2">
                  <input type="radio" name={`${ids}-which`} checked={which === "latest"} onChange={() => setWhich("latest")} />
                  The latest version (follows new saves)
                </label>
                <label className="flex items-center gap-2">
                  <input type="radio" name={`${ids}-which`} checked={which === "version"} onChange={() => setWhich("version")} />
                  Version {props.versionNumber} only (never changes)
                </label>
              </fieldset>

              <div className="grid gap-1">
                <label htmlFor={`${ids}-link`} className="text-sm font-medium">
                  Link
                </label>
                <div className="flex gap-2">
                  <input id={`${ids}-link`} ref={linkField} readOnly value={pageUrl} className={`${field} min-w-0 flex-1 font-mono`} onFocus={(e) => e.currentTarget.select()} />
                  <button type="button" className={button} onClick={() => void copy("link")} data-testid="copy-link">
                    {copied === "link" ? "Copied" : "Copy link"}
                  </button>
                </div>
              </div>

              <fieldset className="grid gap-3">
                <legend className="mb-1 text-sm font-medium">Embed on a web page</legend>
                <div className="flex flex-wrap items-end gap-4 text-sm">
                  <label className="grid gap-1">
                    Width (pixels)
                    <input
                      type="number"
                      min={EMBED_WIDTH.min}
                      max={EMBED_WIDTH.max}
                      step={10}
                      value={width}
                      onChange={(e) => setWidth(Number(e.currentTarget.value))}
                      className={`${field} w-28 font-mono`}
                      data-testid="embed-width"
                    />
                  </label>
                  <label className="grid gap-1">
                    Start at bar
                    <input
                      type="number"
                      min={1}
                      max={props.bars}
                      value={startBar}
                      onChange={(e) => setStartBar(Number(e.currentTarget.value) || 1)}
                      className={`${field} w-24 font-mono`}
                      data-testid="embed-start-bar"
                    />
                  </label>
                  <label className="flex items-center gap-2 pb-2">
                    <input type="checkbox" checked={props.hasKeys && keys} disabled={!props.hasKeys} onChange={(e) => setKeys(e.currentTarget.checked)} data-testid="embed-keys" />
                    Show the keys part
                  </label>
                </div>
                <textarea
                  ref={snippetField}
                  readOnly
                  rows={3}
                  value={snippet || "Working out the height…"}
                  className={`${field} font-mono`}
                  aria-label="Embed code"
                  onFocus={(e) => e.currentTarget.select()}
                  data-testid="embed-snippet"
                />
                <div className="flex flex-wrap items-center gap-3">
                  <button type="button" className={button} onClick={() => void copy("snippet")} disabled={!snippet} data-testid="copy-snippet">
                    {copied === "snippet" ? "Copied" : "Copy embed code"}
                  </button>
                  <a href={embedUrl} target="_blank" rel="noopener" className="text-sm text-brass">
                    Open the embed
                  </a>
                </div>
                <p className="text-xs text-ink-faint">The embed never plays by itself: the reader presses play. It fits narrower pages by re-wrapping the bars.</p>
              </fieldset>
            </>
          )}
          <p role="status" aria-live="polite" className="min-h-5 text-sm" data-testid="share-status">
            {copied === "link" ? "Link copied to the clipboard." : copied === "snippet" ? "Embed code copied to the clipboard." : (problem ?? "")}
          </p>
        </div>
      </dialog>
    </>
  );
}
