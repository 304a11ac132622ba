// A private PostgreSQL cluster for the project, under .data/, on 127.0.0.1 at a project port.
// Node built-ins only. PostgreSQL refuses to run as root, so as root every server command runs as `postgres`.
import { createHash } from "node:crypto";
import { chownSync, closeSync, existsSync, mkdirSync, openSync, readdirSync, readFileSync, renameSync, rmdirSync, appendFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { Fatal, HOST, ROOT, aptInstall, canApt, isRoot, pidAlive, portFree, portFromEnv, rel, run, say, sleep, warn } from "./common.mjs";

const PG_LIB = "/usr/lib/postgresql";

/** The clusters the project manages. Dev keeps PostgreSQL's durable defaults; test trades durability for speed. */
export const CLUSTERS = {
  dev: { folder: "postgres", portEnv: "PGPORT", defaultPort: 55432, durable: true, database: "tactus" },
  test: { folder: "postgres-test", portEnv: "TEST_PGPORT", defaultPort: 55433, durable: false, database: "tactus_test" },
};

/** Folder holding cluster data, sockets and logs (TACTUS_DATA_DIR overrides `<repo>/.data`). */
export function dataBase() {
  return path.resolve(process.env.TACTUS_DATA_DIR || path.join(ROOT, ".data"));
}

/** Installed PostgreSQL majors, newest first, e.g. [16, 15]. */
function installedMajors() {
  if (!existsSync(PG_LIB)) return [];
  return readdirSync(PG_LIB)
    .filter((name) => /^\d+$/.test(name) && existsSync(path.join(PG_LIB, name, "bin", "postgres")))
    .map(Number)
    .sort((a, b) => b - a);
}

/**
 * Returns the bin folder of the PostgreSQL server to use, installing Debian's package first when none is present
 * and we are root. `major` asks for the version an existing cluster was created with.
 */
export function postgresBin(major) {
  let majors = installedMajors();
  if (majors.length === 0) {
    if (!canApt()) {
      throw new Fatal(
        "PostgreSQL server not found (no /usr/lib/postgresql/*/bin/postgres): install Debian's postgresql package " +
          "(as root: apt-get install postgresql) and run again.",
      );
    }
    // Stop Debian from creating and starting its own default cluster: the project runs a private one.
    mkdirSync("/etc/postgresql-common/createcluster.d", { recursive: true });
    appendFileSync("/etc/postgresql-common/createcluster.d/tactus.conf", "create_main_cluster = false\n");
    if (!aptInstall(["postgresql", "postgresql-contrib"])) {
      throw new Fatal("apt-get could not install postgresql: check the apt output above (network, apt sources), then run again.");
    }
    majors = installedMajors();
    if (majors.length === 0) throw new Fatal("apt-get finished but no PostgreSQL server is under /usr/lib/postgresql: install postgresql by hand.");
  }
  if (major !== undefined) {
    if (!majors.includes(major)) {
      throw new Fatal(
        `the project cluster was created by PostgreSQL ${major}, but only ${majors.join(", ")} is installed: ` +
          `install postgresql-${major}, or move the data folder aside to create a new cluster.`,
      );
    }
    return path.join(PG_LIB, String(major), "bin");
  }
  return path.join(PG_LIB, String(majors[0]), "bin");
}

/** The first folder on the way to `dir` that the postgres user cannot enter, or null. */
function firstBlockedFolder(dir) {
  if (!isRoot) return null;
  if (run("test", ["-x", dir], { asPostgres: true }).status === 0) return null;
  const parts = path.resolve(dir).split(path.sep).filter(Boolean);
  let current = path.sep;
  for (const part of parts) {
    current = path.join(current, part);
    if (run("test", ["-x", current], { asPostgres: true }).status !== 0) return current;
  }
  return dir;
}

/** Gives a path to the postgres user when we are root. */
let postgresIds = null;
function giveToPostgres(p) {
  if (!isRoot) return;
  if (!postgresIds) {
    const uid = run("id", ["-u", "postgres"]);
    const gid = run("id", ["-g", "postgres"]);
    if (uid.status !== 0 || gid.status !== 0) {
      throw new Fatal("running as root but there is no `postgres` system user: reinstall Debian's postgresql package.");
    }
    postgresIds = [Number(uid.stdout.trim()), Number(gid.stdout.trim())];
  }
  chownSync(p, postgresIds[0], postgresIds[1]);
}

/**
 * Where a cluster lives. As root, PostgreSQL runs as `postgres`, which must be able to enter every parent folder.
 * The dev cluster stops with advice when it cannot; the disposable test cluster moves to the system temp folder.
 */
export function clusterPaths(kind) {
  const spec = CLUSTERS[kind];
  let base = dataBase();
  mkdirSync(base, { recursive: true, mode: 0o755 });
  const blocked = firstBlockedFolder(base);
  if (blocked) {
    if (kind === "dev") {
      throw new Fatal(
        `PostgreSQL runs as the postgres user, which cannot enter ${blocked}: clone the project outside it, ` +
          `run \`chmod o+x ${blocked}\`, or set TACTUS_DATA_DIR to a folder it can reach.`,
      );
    }
    const hash = createHash("sha256").update(ROOT).digest("hex").slice(0, 10);
    const fallback = path.join(os.tmpdir(), `tactus-${hash}`);
    warn(`the postgres user cannot enter ${blocked}: the test cluster lives in ${fallback} instead`);
    base = fallback;
    mkdirSync(base, { recursive: true, mode: 0o755 });
  }
  const dataDir = path.join(base, spec.folder);
  let sockDir = path.join(base, "sockets");
  // Unix socket paths are limited to about 107 bytes: beyond that, listen on TCP only.
  if (Buffer.byteLength(path.join(sockDir, ".s.PGSQL.65535")) > 100) sockDir = "";
  return { base, dataDir, sockDir, logFile: path.join(base, `${spec.folder}.log`) };
}

function readPidFile(dataDir) {
  const file = path.join(dataDir, "postmaster.pid");
  if (!existsSync(file)) return null;
  const lines = readFileSync(file, "utf8").split("\n");
  return { pid: Number(lines[0]), port: Number(lines[3]), file };
}

/** What /proc says about a process: its command name and whether it is a zombie. */
function procInfo(pid) {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, "utf8");
    const comm = stat.slice(stat.indexOf("(") + 1, stat.lastIndexOf(")"));
    const state = stat.slice(stat.lastIndexOf(")") + 2, stat.lastIndexOf(")") + 3);
    return { comm, zombie: state === "Z" };
  } catch {
    return null;
  }
}

function isReady(binDir, port) {
  return run(path.join(binDir, "pg_isready"), ["-q", "-h", HOST, "-p", String(port), "-U", "postgres", "-d", "postgres"]).status === 0;
}

async function waitReady(binDir, port, seconds) {
  const until = Date.now() + seconds * 1000;
  while (Date.now() < until) {
    if (isReady(binDir, port)) return true;
    await sleep(200);
  }
  return false;
}

/** The last FATAL/ERROR line of a PostgreSQL log, for a one-line explanation. */
function lastLogProblem(logFile) {
  try {
    const lines = readFileSync(logFile, "utf8").trim().split("\n").slice(-30);
    return [...lines].reverse().find((l) => /FATAL|PANIC|ERROR|could not/.test(l))?.trim() ?? null;
  } catch {
    return null;
  }
}

function clusterMajor(dataDir) {
  return Number(readFileSync(path.join(dataDir, "PG_VERSION"), "utf8").trim());
}

function initCluster(kind, paths) {
  const { dataDir, sockDir } = paths;
  const binDir = postgresBin();
  const leftovers = readdirSync(path.dirname(dataDir)).filter((n) => n.startsWith(`${path.basename(dataDir)}.init-`));
  if (leftovers.length) warn(`left-over folders from an interrupted set-up (safe to remove by hand): ${leftovers.join(", ")}`);
  // initdb into a temporary folder, then rename: an interrupted initdb never leaves a half-made cluster behind.
  const temp = `${dataDir}.init-${process.pid}`;
  mkdirSync(temp, { mode: 0o700 });
  giveToPostgres(temp);
  say(`creating the ${kind} PostgreSQL cluster in ${rel(dataDir)}`);
  const init = run(
    path.join(binDir, "initdb"),
    ["-U", "postgres", "-E", "UTF8", "--locale=C.UTF-8", "--auth-local=trust", "--auth-host=trust", "-D", temp],
    { asPostgres: true },
  );
  if (init.status !== 0) {
    const detail = (init.stderr.trim().split("\n").pop() ?? "").trim();
    throw new Fatal(`initdb failed for ${rel(dataDir)}: ${detail} (the partial folder ${rel(temp)} can be removed by hand).`);
  }
  const settings = [
    "",
    "# Added by the Tactus scripts: a private cluster reachable only from this machine.",
    `listen_addresses = '${HOST}'`,
    `unix_socket_directories = '${sockDir.replaceAll("'", "''")}'`,
  ];
  if (!CLUSTERS[kind].durable) {
    settings.push("# Test cluster only: data is thrown away after each run, so skip durability for speed.");
    settings.push("fsync = off", "synchronous_commit = off", "full_page_writes = off");
  }
  appendFileSync(path.join(temp, "postgresql.conf"), `${settings.join("\n")}\n`);
  renameSync(temp, dataDir);
}

/**
 * Makes sure the cluster of `kind` exists and runs on its port.
 * Returns { binDir, port, startedNow, paths }.
 */
export async function ensureCluster(kind) {
  const spec = CLUSTERS[kind];
  const port = portFromEnv(spec.portEnv, spec.defaultPort);
  const paths = clusterPaths(kind);
  const { dataDir, logFile, sockDir } = paths;

  if (existsSync(dataDir)) {
    const entries = readdirSync(dataDir);
    if (entries.length === 0) rmdirSync(dataDir);
    else if (!existsSync(path.join(dataDir, "PG_VERSION"))) {
      throw new Fatal(
        `${rel(dataDir)} exists but is not a complete PostgreSQL cluster (no PG_VERSION): it was probably created half-way. ` +
          "Nothing was deleted: move it aside or remove it yourself, then run again.",
      );
    }
  }
  if (!existsSync(dataDir)) initCluster(kind, paths);
  const binDir = postgresBin(clusterMajor(dataDir));

  // Is a server already running on this data folder?
  const lock = readPidFile(dataDir);
  if (lock && Number.isInteger(lock.pid) && lock.pid > 0 && pidAlive(lock.pid)) {
    let info = procInfo(lock.pid);
    // After a hard kill the postmaster can linger as a zombie for a few seconds: wait for it to go.
    for (let i = 0; i < 50 && info?.zombie; i++) {
      await sleep(100);
      info = procInfo(lock.pid);
    }
    if (info && !info.zombie) {
      if (!/postgres|postmaster/.test(info.comm)) {
        throw new Fatal(
          `stale lock ${rel(lock.file)}: it names PID ${lock.pid}, which is now "${info.comm}", not PostgreSQL. ` +
            "If no PostgreSQL uses this folder, remove that one file and run again.",
        );
      }
      if (lock.port !== port) {
        throw new Fatal(
          `the ${kind} cluster is already running on port ${lock.port}, not ${port}: stop it with \`npm run db:stop\` ` +
            `or set ${spec.portEnv}=${lock.port}.`,
        );
      }
      if (await waitReady(binDir, port, 30)) return { binDir, port, startedNow: false, paths };
      throw new Fatal(
        `PostgreSQL (PID ${lock.pid}) holds ${rel(dataDir)} but does not answer on ${HOST}:${port}: ` +
          `see ${rel(logFile)}; stop it with \`npm run db:stop\` and run again.`,
      );
    }
  } else if (lock) {
    say(`found a stale ${rel(lock.file)} (PID ${lock.pid} is gone): PostgreSQL replaces it on start`);
  }

  if (!(await portFree(port))) {
    throw new Fatal(`port ${port} on ${HOST} is already in use by another program: stop it, or choose another port with ${spec.portEnv}=NNNNN.`);
  }

  for (const p of [path.dirname(logFile)]) mkdirSync(p, { recursive: true });
  closeSync(openSync(logFile, "a"));
  giveToPostgres(logFile);
  if (sockDir) {
    mkdirSync(sockDir, { recursive: true, mode: 0o755 });
    giveToPostgres(sockDir);
  }
  say(`starting the ${kind} PostgreSQL cluster on ${HOST}:${port}`);
  const options = `-p ${port} -c unix_socket_directories='${sockDir.replaceAll("'", "''")}'`;
  const started = run(path.join(binDir, "pg_ctl"), ["-w", "-t", "60", "-D", dataDir, "-l", logFile, "-o", options, "start"], {
    asPostgres: true,
  });
  if (started.status !== 0 || !(await waitReady(binDir, port, 30))) {
    const problem = lastLogProblem(logFile) ?? started.stderr.trim().split("\n").pop();
    throw new Fatal(`PostgreSQL did not start: ${problem} (full log: ${rel(logFile)}).`);
  }
  return { binDir, port, startedNow: true, paths };
}

/** Runs one SQL statement through psql against the maintenance database. */
function psql(binDir, port, sql) {
  return run(path.join(binDir, "psql"), ["-X", "-q", "-v", "ON_ERROR_STOP=1", "-h", HOST, "-p", String(port), "-U", "postgres", "-d", "postgres", "-tAc", sql]);
}

/** Creates `name` when missing; with `fresh`, drops and recreates it first (only ever used for the test database). */
export function ensureDatabase({ binDir, port }, name, { fresh = false } = {}) {
  if (!/^[a-z_][a-z0-9_]*$/.test(name)) throw new Fatal(`database name "${name}" must be lower-case letters, digits and _.`);
  if (fresh) {
    const drop = psql(binDir, port, `DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
    if (drop.status !== 0) throw new Fatal(`could not drop the test database ${name}: ${drop.stderr.trim()}`);
  }
  const exists = psql(binDir, port, `SELECT 1 FROM pg_database WHERE datname = '${name}'`);
  if (exists.status !== 0) throw new Fatal(`could not query PostgreSQL on port ${port}: ${exists.stderr.trim()}`);
  if (exists.stdout.trim() !== "1") {
    const create = psql(binDir, port, `CREATE DATABASE ${name}`);
    if (create.status !== 0) throw new Fatal(`could not create database ${name}: ${create.stderr.trim()}`);
  }
  return `postgres://postgres@${HOST}:${port}/${name}`;
}

/** Stops the cluster of `kind` if it runs. Returns true when it was stopped. */
export function stopCluster(kind) {
  const spec = CLUSTERS[kind];
  const base = dataBase();
  const candidates = [path.join(base, spec.folder)];
  if (kind === "test") {
    const hash = createHash("sha256").update(ROOT).digest("hex").slice(0, 10);
    candidates.push(path.join(os.tmpdir(), `tactus-${hash}`, spec.folder));
  }
  let stopped = false;
  for (const dataDir of candidates) {
    const lock = readPidFile(dataDir);
    if (!lock || !pidAlive(lock.pid)) continue;
    const binDir = postgresBin(clusterMajor(dataDir));
    const result = run(path.join(binDir, "pg_ctl"), ["-D", dataDir, "-m", "fast", "-w", "-t", "60", "stop"], { asPostgres: true });
    if (result.status !== 0) throw new Fatal(`could not stop the ${kind} cluster in ${rel(dataDir)}: ${result.stderr.trim()}`);
    say(`stopped the ${kind} PostgreSQL cluster (${rel(dataDir)})`);
    stopped = true;
  }
  return stopped;
}
