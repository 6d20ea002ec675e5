// The same histograms as the check, computed by DuckDB with SQL over the Parquet file: one histogram() aggregate
// per feature with the reference's own edges, feature queries joined by UNION ALL (the fastest of the SQL forms
// tried: CASE trees and comparison sums were several times slower). Prints JSON: start-up and query seconds and
// the cells (underflow, bins, overflow) of every feature.
//
// usage: node duckdb-histograms.cjs MODULES_DIR SAMPLE.parquet REFERENCE.json THREADS OUT.json
'use strict';
const { createRequire } = require('node:module');
const { readFileSync, writeFileSync } = require('node:fs');
const path = require('node:path');

const [modules, sample, referenceJson, threads, out] = process.argv.slice(2);
if (!out) {
  console.error('usage: node duckdb-histograms.cjs MODULES_DIR SAMPLE.parquet REFERENCE.json THREADS OUT.json');
  process.exit(2);
}
const started = performance.now();
const { DuckDBInstance } = createRequire(path.join(path.resolve(modules), 'node_modules', 'x.js'))('@duckdb/node-api');
const reference = JSON.parse(readFileSync(referenceJson, 'utf8'));

// The largest double below x. DuckDB's histogram(x, boundaries) puts x in the bucket of the first boundary >= x,
// (previous, boundary], and values above the last boundary under a NULL key; our bins are [lower, upper). With the
// boundaries one ulp below each edge, x <= down(e) is exactly x < e, so the buckets are our cells one for one
// (verified: the script compares every cell with the engine's).
function down(x) {
  if (x === 0) return -Number.MIN_VALUE;
  const view = new DataView(new ArrayBuffer(8));
  view.setFloat64(0, x);
  const bits = view.getBigUint64(0);
  view.setBigUint64(0, x > 0 ? bits - 1n : bits + 1n);
  return view.getFloat64(0);
}

// A string cast parses with correct rounding; a bare literal could go through DECIMAL first.
const literal = (x) => `'${down(x)}'::DOUBLE`;
const quoted = (name) => `"${name.replaceAll('"', '""')}"`;
const file = `'${path.resolve(sample).replaceAll("'", "''")}'`;

(async () => {
  const instance = await DuckDBInstance.create(':memory:', { threads: String(threads) });
  const connection = await instance.connect();
  const features = Object.entries(reference.features);
  const sql = features
    .map(([name, f], i) => `SELECT ${i} AS feature, histogram(CAST(${quoted(f.column)} AS DOUBLE), [${f.edges.map(literal).join(', ')}]) AS cells FROM read_parquet(${file})`)
    .join('\nUNION ALL\n');
  const ready = performance.now();
  const rows = (await connection.runAndReadAll(sql)).getRowsJS();
  const done = performance.now();

  const cells = {};
  for (const [index, map] of rows) {
    const [name, f] = features[Number(index)];
    const counts = new Array(f.edges.length + 1).fill(0);
    const slot = new Map(f.edges.map((e, k) => [down(e), k]));
    for (const { key, value } of map) {
      // Values above the last boundary come back under +Infinity (NULL in some versions): the overflow cell.
      const cell = key === null || key === Infinity ? f.edges.length : slot.get(key);
      if (cell === undefined) throw new Error(`feature ${name}: unexpected bucket ${key}`);
      counts[cell] += Number(value);
    }
    cells[name] = counts;
  }
  const version = (await connection.runAndReadAll('SELECT version()')).getRowsJS()[0][0];
  writeFileSync(out, JSON.stringify({
    engine: `DuckDB ${version}`,
    threads: Number(threads),
    startup_seconds: (ready - started) / 1000,
    seconds: (done - ready) / 1000,
    features: cells,
  }, null, 1));
})().catch((e) => {
  console.error(`duckdb-histograms: ${e.message}`);
  process.exit(1);
});
