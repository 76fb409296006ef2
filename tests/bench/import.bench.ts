/**
 * Benchmark of the logbook import. Run with `npm run bench -- import`.
 * Generates an invented CSV logbook (one count a day, with hemisphere
 * counts, seeing and the odd note) as a stream, and imports it into a fresh
 * temporary database through the same function the route uses: streaming
 * parse, row checks with the observation schema, staging, duplicate checks
 * and one transaction. Each size runs in its own processes (one timed, one
 * measuring memory) so that peak memory (RSS and live heap, sampled at every
 * chunk read after a full collection) belongs to that size alone;
 * flat memory from 10k to 100k rows shows the file is never held whole.
 * The Review desk's flags for a large import run afterwards in the
 * background; their time is reported separately. Prints one line per size
 * and a final JSON line.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { loadavg, tmpdir } from "node:os";
import path from "node:path";
import { performance } from "node:perf_hooks";
import { Readable } from "node:stream";

const SIZES = [10_000, 100_000];
const FIRST_DAY_MS = Date.UTC(1740, 0, 1);
const DAY_MS = 86_400_000;

/** Invented counts from a smooth 11-year cycle; deterministic (no randomness needed). */
function* generateCsv(rows: number): Generator<string> {
  yield "date,time,g,s,gN,sN,gS,sS,seeing,notes\n";
  let chunk = "";
  for (let i = 0; i < rows; i++) {
    const day = new Date(FIRST_DAY_MS + i * DAY_MS).toISOString().slice(0, 10);
    const phase = Math.sin((Math.PI * i) / (11 * 365.25));
    const groups = Math.round(8 * phase * phase + ((i * 7) % 3));
    const spots = groups === 0 ? 0 : groups + ((i * 13) % (5 * groups + 1));
    const northGroups = Math.floor(groups / 2);
    const northSpots =
      groups === 0
        ? 0
        : northGroups === 0
          ? 0
          : Math.min(spots - (groups - northGroups), northGroups + ((i * 3) % 4));
    const hemispheres =
      i % 3 === 0 ? `${northGroups},${northSpots},${groups - northGroups},${spots - northSpots}` : ",,,";
    const note = i % 50 === 0 ? `"cirrus, then clear"` : "";
    chunk += `${day},${String(8 + (i % 6)).padStart(2, "0")}:${String((i * 7) % 60).padStart(2, "0")},${groups},${spots},${hemispheres},${1 + (i % 5)},${note}\n`;
    if (chunk.length > 64 * 1024) {
      yield chunk;
      chunk = "";
    }
  }
  if (chunk) yield chunk;
}

function measureCsvBytes(rows: number): number {
  let bytes = 0;
  for (const part of generateCsv(rows)) bytes += Buffer.byteLength(part);
  return bytes;
}

/**
 * One import of `rows` lines. With `collect`, memory is sampled after a full
 * garbage collection (the live size); without, sampling is cheap and the
 * timing is not disturbed by those collections.
 */
async function runOne(rows: number, { collect }: { collect: boolean }) {
  const folder = mkdtempSync(path.join(tmpdir(), "heliotally-import-bench-"));
  process.env.DATABASE_URL = `file:${path.join(folder, "bench.db")}`;
  process.env.HELIOTALLY_DEMO = "false";
  const { getDb } = await import("@/db/client");
  const { prepareDatabase } = await import("@/db/prepare");
  const { users, observers, instruments } = await import("@/db/schema");
  const { importLogbook } = await import("@/lib/import/run-import");
  const { waitForImportFlagJobs } = await import("@/lib/import/flag-import");
  const { importOptionsSchema } = await import("@/lib/validation/import");

  const db = getDb();
  await prepareDatabase({ db, url: process.env.DATABASE_URL });
  const [user] = await db
    .insert(users)
    .values({ name: "Bench observer (invented)", email: "bench@example.test" })
    .returning();
  const [observer] = await db
    .insert(observers)
    .values({ userId: user!.id, displayName: "Bench", code: "HT-BNCH" })
    .returning();
  const [instrument] = await db
    .insert(instruments)
    .values({ observerId: observer!.id, name: "Bench pinhole", kind: "pinhole" })
    .returning();
  const options = importOptionsSchema.parse({
    date: "1",
    time: "2",
    groups: "3",
    spots: "4",
    northGroups: "5",
    northSpots: "6",
    southGroups: "7",
    southSpots: "8",
    seeing: "9",
    notes: "10",
    dateFormat: "yyyy-mm-dd",
    timeZone: "Europe/Paris",
    instrumentId: instrument!.id,
    fileName: `bench-${rows}.csv`,
  });
  const totalBytes = measureCsvBytes(rows);

  global.gc?.();
  const baseline = process.memoryUsage();
  let peakRss = baseline.rss;
  let peakHeap = baseline.heapUsed;
  let samples = 0;
  // The import seldom yields to timers (the embedded database answers
  // synchronously), so memory is sampled from inside the work instead: at
  // every 64 KB chunk read and at every progress report (every 5,000 rows).
  const sample = () => {
    // A full collection first, so the figure is what the import keeps alive
    // rather than garbage not yet collected.
    if (collect) global.gc?.();
    const m = process.memoryUsage();
    peakRss = Math.max(peakRss, m.rss);
    peakHeap = Math.max(peakHeap, m.heapUsed);
    samples++;
    if (process.env.BENCH_TRACE)
      console.error(
        `trace rss=${Math.round(m.rss / 2 ** 20)} heap=${Math.round(m.heapUsed / 2 ** 20)} ext=${Math.round(m.external / 2 ** 20)} ab=${Math.round(m.arrayBuffers / 2 ** 20)}`,
      );
  };
  function* sampled(source: Generator<string>) {
    for (const chunk of source) {
      sample();
      yield chunk;
    }
  }

  const cpuStart = process.cpuUsage();
  const start = performance.now();
  const report = await importLogbook({
    observerId: observer!.id,
    byUserId: user!.id,
    input: Readable.from(sampled(generateCsv(rows))),
    totalBytes,
    fileHash: "bench",
    options,
    onProgress: sample,
  });
  const importMs = performance.now() - start;
  const cpu = process.cpuUsage(cpuStart);
  const importCpuMs = (cpu.user + cpu.system) / 1000;
  sample();
  if (!report.ok)
    throw new Error(
      `The benchmark file was refused: ${report.message} ${JSON.stringify(report.problems.slice(0, 3))}`,
    );
  if (report.imported !== rows) throw new Error(`Imported ${report.imported} of ${rows} rows`);

  const flagStart = performance.now();
  await waitForImportFlagJobs();
  const flagMs = performance.now() - flagStart;
  db.$client.close();
  rmSync(folder, { recursive: true, force: true });

  const mb = (bytes: number) => Math.round((bytes / 2 ** 20) * 10) / 10;
  return {
    rows,
    fileMb: mb(totalBytes),
    importMs: Math.round(importMs),
    rowsPerSecond: Math.round(rows / (importMs / 1000)),
    // On a shared machine the wall clock also counts other people's work;
    // rows per CPU-second of this process is the figure that does not.
    importCpuMs: Math.round(importCpuMs),
    rowsPerCpuSecond: Math.round(rows / (importCpuMs / 1000)),
    baselineRssMb: mb(baseline.rss),
    peakRssMb: mb(peakRss),
    rssGrowthMb: mb(peakRss - baseline.rss),
    baselineHeapMb: mb(baseline.heapUsed),
    peakHeapMb: mb(peakHeap),
    heapGrowthMb: mb(peakHeap - baseline.heapUsed),
    memorySamples: samples,
    flagsMs: Math.round(flagMs),
    flagsPerSecond: Math.round(rows / (flagMs / 1000)),
  };
}

async function main() {
  const only = process.argv.find((a) => a.startsWith("--rows="));
  if (only) {
    const collect = process.argv.includes("--collect");
    console.log(JSON.stringify(await runOne(Number(only.slice("--rows=".length)), { collect })));
    return;
  }
  const runChild = (rows: number, collect: boolean) => {
    const child = spawnSync(
      process.execPath,
      // tsx as a loader (not its CLI, which starts yet another process) so that
      // --expose-gc reaches the script and memory is measured after collection.
      [
        "--expose-gc",
        "--conditions=react-server",
        "--import",
        "tsx",
        process.argv[1]!,
        `--rows=${rows}`,
        ...(collect ? ["--collect"] : []),
      ],
      { encoding: "utf8", env: process.env, maxBuffer: 16 * 1024 * 1024 },
    );
    if (child.status !== 0) {
      console.error(child.stdout, child.stderr);
      process.exit(1);
    }
    return JSON.parse(child.stdout.trim().split("\n").at(-1)!);
  };
  const results = [];
  for (const rows of SIZES) {
    // Speed from a run left alone; memory from a second run that collects
    // garbage before every sample.
    const timed = runChild(rows, false);
    const measured = runChild(rows, true);
    const result = {
      ...timed,
      baselineRssMb: measured.baselineRssMb,
      peakRssMb: measured.peakRssMb,
      rssGrowthMb: measured.rssGrowthMb,
      baselineHeapMb: measured.baselineHeapMb,
      peakHeapMb: measured.peakHeapMb,
      heapGrowthMb: measured.heapGrowthMb,
      memorySamples: measured.memorySamples,
    };
    results.push(result);
    console.log(
      `${String(rows).padStart(7)} rows (${result.fileMb} MB): import ${result.importMs} ms = ${result.rowsPerSecond} rows/s ` +
        `(${result.rowsPerCpuSecond} rows per CPU-second); ` +
        `peak RSS ${result.peakRssMb} MB (+${result.rssGrowthMb}), peak heap ${result.peakHeapMb} MB (+${result.heapGrowthMb}); ` +
        `background flags ${result.flagsMs} ms (${result.flagsPerSecond} rows/s)`,
    );
  }
  const [small, large] = results;
  console.log(
    JSON.stringify({
      benchmark: "import",
      results,
      targetRowsPerSecond: 20_000,
      meetsTarget: results.every((r) => r.rowsPerSecond >= 20_000),
      loadAverage1m: Math.round(loadavg()[0]! * 10) / 10,
      heapGrowthRatio100kTo10k:
        small && large
          ? Math.round((large.heapGrowthMb / Math.max(1, small.heapGrowthMb)) * 100) / 100
          : null,
      node: process.version,
    }),
  );
}

void main();
