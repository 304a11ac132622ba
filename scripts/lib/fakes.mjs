// Local fakes: small in-process stand-ins for outside services (mail capture, object storage, ...).
// Each file in scripts/fakes/*.mjs exports `name` and `start({ mode })`, where mode is "dev" or "test".
// start() resolves to { env, stop }: `env` holds the variables the app needs to reach the fake
// (for example SMTP_URL), `stop()` closes it. The start and test scripts start every fake the same way.
import { readdirSync } from "node:fs";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { Fatal, ROOT, say } from "./common.mjs";

/** Starts every fake for `mode`; resolves to { env, stopAll }. */
export async function startFakes(mode) {
  const folder = path.join(ROOT, "scripts", "fakes");
  let files = [];
  try {
    files = readdirSync(folder).filter((f) => f.endsWith(".mjs")).sort();
  } catch {
    files = [];
  }
  const running = [];
  const env = {};
  const stopAll = async () => {
    for (const fake of running.reverse()) {
      try {
        await fake.stop?.();
      } catch {
        // A fake that fails to close must not hide the real outcome.
      }
    }
  };
  for (const file of files) {
    const mod = await import(pathToFileURL(path.join(folder, file)).href);
    const name = mod.name ?? file;
    try {
      const started = await mod.start({ mode });
      running.push(started);
      Object.assign(env, started.env ?? {});
      say(`started local fake: ${name}${started.describe ? ` (${started.describe})` : ""}`);
    } catch (error) {
      await stopAll();
      if (error instanceof Fatal) throw error;
      throw new Fatal(`local fake "${name}" (scripts/fakes/${file}) did not start: ${error?.message ?? error}`);
    }
  }
  return { env, stopAll };
}
