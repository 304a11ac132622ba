// Astro configuration: server output on the Node adapter, React islands, Tailwind v4 through its Vite plugin.
import { defineConfig } from "astro/config";
import node from "@astrojs/node";
import react from "@astrojs/react";
import tailwindcss from "@tailwindcss/vite";

export default defineConfig({
  output: "server",
  // npm test builds into its own folder so a running `npm start` keeps serving its files.
  outDir: process.env.TACTUS_OUT_DIR ?? "./dist",
  adapter: node({ mode: "standalone" }),
  integrations: [react()],
  server: {
    host: process.env.HOST ?? "127.0.0.1",
    port: Number(process.env.PORT ?? 4321),
  },
  // Keep Astro's CSRF check for form posts on (it is the default in Astro 5).
  security: { checkOrigin: true },
  vite: {
    plugins: [tailwindcss()],
  },
});
