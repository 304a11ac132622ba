#!/usr/bin/env node
// `npm run db:stop`: stops the project's PostgreSQL clusters (dev and test) if they run. Data stays in .data/.
import { runMain, say } from "./lib/common.mjs";
import { stopCluster } from "./lib/postgres.mjs";

runMain(async () => {
  const dev = stopCluster("dev");
  const test = stopCluster("test");
  if (!dev && !test) say("no project PostgreSQL cluster is running");
});
